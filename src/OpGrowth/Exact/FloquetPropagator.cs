using System.Numerics;
using OpGrowth.Models;

namespace OpGrowth.Exact;

/// <summary>
/// Evolves state vectors under a periodic drive made of Pauli rotations exp(-i theta P / 2): one
/// period applies the layers in order (layer 0 first) and the rotations of a layer in listed order.
/// Each rotation is one pass over the vector: psi &lt;- cos(theta/2) psi - i sin(theta/2) P psi, done in
/// place pair by pair (P maps k to k ^ X). Exact up to rounding; times must be whole periods.
/// </summary>
public sealed class FloquetPropagator
{
    private readonly (PauliMask Mask, double Cos, double Sin)[] _forward;
    private readonly int _threads;

    /// <summary>Number of qubits.</summary>
    public int N { get; }

    /// <summary>Duration of one period.</summary>
    public double Period { get; }

    /// <summary>Rotations applied so far.</summary>
    public long RotationsApplied { get; private set; }

    /// <summary>Builds the propagator for a drive on <paramref name="n"/> qubits.</summary>
    public FloquetPropagator(int n, FloquetDrive drive, int threads = 0)
    {
        ArgumentNullException.ThrowIfNull(drive);
        StateVector.Dimension(n);
        N = n;
        Period = drive.Period;
        _threads = threads > 0 ? threads : Environment.ProcessorCount;
        _forward = drive.Layers.SelectMany(l => l).Select(r =>
        {
            if (r.Generator.N != n) throw new ArgumentException($"Rotation {r} acts on {r.Generator.N} qubits, expected {n}.", nameof(drive));
            return (PauliMask.From(r.Generator), Math.Cos(r.Angle / 2), Math.Sin(r.Angle / 2));
        }).ToArray();
    }

    /// <summary>Number of whole periods in t; throws when t is not a whole number of periods.</summary>
    public int Periods(double t)
    {
        double m = t / Period;
        double r = Math.Round(m);
        if (Math.Abs(m - r) > 1e-9 * Math.Max(1, Math.Abs(m))) throw new ArgumentException($"Time {t} is not a whole number of drive periods ({Period}).", nameof(t));
        return (int)r;
    }

    /// <summary>psi &lt;- U(t) psi for t a whole number of periods (negative t runs backward).</summary>
    public void Evolve(Complex[] psi, double t)
    {
        ArgumentNullException.ThrowIfNull(psi);
        int m = Periods(t);
        for (int p = 0; p < Math.Abs(m); p++)
        {
            if (m > 0)
            {
                for (int i = 0; i < _forward.Length; i++) Rotate(psi, _forward[i].Mask, _forward[i].Cos, _forward[i].Sin);
            }
            else
            {
                for (int i = _forward.Length - 1; i >= 0; i--) Rotate(psi, _forward[i].Mask, _forward[i].Cos, -_forward[i].Sin);
            }
        }
    }

    // psi <- (c - i s P) psi, in place.
    private void Rotate(Complex[] psi, PauliMask p, double c, double s)
    {
        RotationsApplied++;
        int len = psi.Length;
        ulong x = p.X;
        void Body(int ch)
        {
            var (st, l) = StateVector.Chunk(ch, len);
            for (int k = st; k < st + l; k++)
            {
                ulong kk = (ulong)k;
                if (x == 0)
                {
                    psi[k] *= new Complex(c, 0) - new Complex(0, s) * p.Factor(kk);
                    continue;
                }
                ulong j = kk ^ x;
                if (j < kk) continue; // each pair once, from its smaller index
                // (P psi)[k] = f(j) psi[j], (P psi)[j] = f(k) psi[k] with f(i) the factor of P|i>.
                Complex a = psi[k], b = psi[(int)j];
                Complex fa = p.Factor(j), fb = p.Factor(kk);
                psi[k] = c * a - new Complex(0, s) * fa * b;
                psi[(int)j] = c * b - new Complex(0, s) * fb * a;
            }
        }
        int chunks = StateVector.ChunkCount(len);
        if (len < StateVector.ParallelThreshold || _threads <= 1)
        {
            for (int ch = 0; ch < chunks; ch++) Body(ch);
        }
        else
        {
            // Pairs (k, k ^ x) can straddle chunks; each pair is owned by its smaller index, and no
            // other pair touches those two amplitudes, so chunks never write the same amplitude.
            Parallel.For(0, chunks, StateVector.Options(_threads), Body);
        }
    }
}
