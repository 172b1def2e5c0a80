using System.Numerics;
using System.Runtime.InteropServices;

namespace OpGrowth.Evolution;

/// <summary>
/// A fast 64-bit checksum for checkpoint files (detects truncation and corruption; not
/// cryptographic): 8 bytes per multiply, segments combined with their lengths.
/// </summary>
internal struct Checksum64
{
    private ulong _h;

    public Checksum64()
    {
        _h = 0x6A09E667F3BCC909UL;
    }

    public readonly ulong Value => _h;

    public void Append(ReadOnlySpan<byte> data)
    {
        ulong h = 0x9E3779B97F4A7C15UL ^ (ulong)data.Length;
        var words = MemoryMarshal.Cast<byte, ulong>(data);
        foreach (ulong w in words) h = BitOperations.RotateLeft((h ^ w) * 0xFF51AFD7ED558CCDUL, 29);
        for (int i = words.Length * 8; i < data.Length; i++) h = (h ^ data[i]) * 0xC4CEB9FE1A85EC53UL;
        _h = Mix(_h ^ Mix(h));
    }

    private static ulong Mix(ulong h)
    {
        h ^= h >> 33;
        h *= 0xFF51AFD7ED558CCDUL;
        h ^= h >> 33;
        h *= 0xC4CEB9FE1A85EC53UL;
        h ^= h >> 33;
        return h;
    }
}
