namespace OpGrowth.Models;

/// <summary>
/// The graph a model lives on: sites 0..N-1, nearest-neighbour edges ("bonds"), optional plaquettes,
/// and the graph distance used for fronts and butterfly velocities.
/// </summary>
/// <remarks>
/// Site numbering: chain and ring 0..N-1 along the chain; ladder site(x, leg) = 2x + leg (rungs are
/// consecutive indices, legs 0 and 1); square site(x, y) = y * Width + x (row-major, x fastest).
/// Bonds are listed once each with A the "earlier" site of the pattern: chain (i, i+1), the ring's
/// closing bond (N-1, 0); square: right neighbour then the neighbour in the next row, per site.
/// </remarks>
public sealed class Lattice
{
    private readonly int[]?[] _rows;
    private readonly List<int>[] _adjacency;

    private Lattice(string kind, int n, bool periodic, int width, int height, List<(int, int)> edges, List<int[]> plaquettes)
    {
        Kind = kind;
        N = n;
        Periodic = periodic;
        Width = width;
        Height = height;
        Edges = edges;
        Plaquettes = plaquettes;
        _rows = new int[n][];
        _adjacency = new List<int>[n];
        for (int i = 0; i < n; i++) _adjacency[i] = [];
        if (kind != "all-to-all")
        {
            foreach (var (a, b) in edges)
            {
                _adjacency[a].Add(b);
                _adjacency[b].Add(a);
            }
        }
    }

    /// <summary>"chain" (open), "ring" (periodic chain), "ladder", "square", "all-to-all" or "edges".</summary>
    public string Kind { get; }

    /// <summary>Number of sites (qubits).</summary>
    public int N { get; }

    /// <summary>Periodic boundary conditions (ring, or periodic ladder/square).</summary>
    public bool Periodic { get; }

    /// <summary>Square: sites per row; ladder: rungs; chain/ring: N; otherwise N.</summary>
    public int Width { get; }

    /// <summary>Square: rows; ladder: 2; otherwise 1.</summary>
    public int Height { get; }

    /// <summary>Nearest-neighbour bonds, each once.</summary>
    public IReadOnlyList<(int A, int B)> Edges { get; }

    /// <summary>Elementary squares (square lattice and ladder), each as four sites around the square:
    /// (x,y), (x+1,y), (x+1,y+1), (x,y+1). Empty for other lattices.</summary>
    public IReadOnlyList<int[]> Plaquettes { get; }

    /// <summary>True for chain, ring and ladder (a front moves along one direction).</summary>
    public bool IsOneDimensional => Kind is "chain" or "ring" or "ladder";

    /// <summary>A central site: N/2 on chains (integer division), the middle of the middle rung or row, the most central site of an edge list, 0 for all-to-all.</summary>
    public int Center => Kind switch
    {
        "chain" or "ring" => N / 2,
        "ladder" => 2 * (Width / 2),
        "square" => (Height / 2) * Width + Width / 2,
        "all-to-all" => 0,
        _ => Enumerable.Range(0, N).MinBy(i => DistancesFrom(i).Max()),
    };

    /// <summary>Largest graph distance between two sites.</summary>
    public int Diameter => Kind switch
    {
        "chain" => N - 1,
        "ring" => N / 2,
        "all-to-all" => N > 1 ? 1 : 0,
        _ => Enumerable.Range(0, N).Max(i => DistancesFrom(i).Max()),
    };

    /// <summary>(x, y) coordinates: chain/ring (i, 0), ladder (i/2, i%2), square (i % Width, i / Width), others (i, 0).</summary>
    public (int X, int Y) Coordinate(int site)
    {
        ArgumentOutOfRangeException.ThrowIfNegative(site);
        ArgumentOutOfRangeException.ThrowIfGreaterThanOrEqual(site, N);
        return Kind switch
        {
            "ladder" => (site / 2, site % 2),
            "square" => (site % Width, site / Width),
            _ => (site, 0),
        };
    }

    /// <summary>Graph distance (number of bonds on a shortest path) between two sites.</summary>
    public int Distance(int i, int j)
    {
        ArgumentOutOfRangeException.ThrowIfNegative(i);
        ArgumentOutOfRangeException.ThrowIfGreaterThanOrEqual(i, N);
        ArgumentOutOfRangeException.ThrowIfNegative(j);
        ArgumentOutOfRangeException.ThrowIfGreaterThanOrEqual(j, N);
        switch (Kind)
        {
            case "chain":
                return Math.Abs(i - j);
            case "ring":
            {
                int d = Math.Abs(i - j);
                return Math.Min(d, N - d);
            }
            case "all-to-all":
                return i == j ? 0 : 1;
            case "square":
            {
                int dx = Math.Abs(i % Width - j % Width), dy = Math.Abs(i / Width - j / Width);
                if (Periodic)
                {
                    dx = Math.Min(dx, Width - dx);
                    dy = Math.Min(dy, Height - dy);
                }
                return dx + dy;
            }
            default:
                return DistancesFrom(i)[j];
        }
    }

    /// <summary>
    /// Euclidean distance between the coordinates of two sites (<see cref="Coordinate"/>), with the nearest
    /// image along periodic directions: |i - j| on a chain (and, since their coordinates are (i, 0), on
    /// all-to-all clusters and edge lists), the shorter way round on a ring, sqrt(dx^2 + dy^2) on a ladder
    /// or square lattice.
    /// </summary>
    public double EuclideanDistance(int i, int j)
    {
        var (xi, yi) = Coordinate(i);
        var (xj, yj) = Coordinate(j);
        int dx = Math.Abs(xi - xj), dy = Math.Abs(yi - yj);
        if (Periodic && Kind is "ring" or "ladder" or "square") dx = Math.Min(dx, Width - dx);
        if (Periodic && Kind == "square") dy = Math.Min(dy, Height - dy);
        return Math.Sqrt((double)dx * dx + (double)dy * dy);
    }

    /// <summary>
    /// The bonds of one orientation: "legs" (along a ladder) and "rungs" (across it), "horizontal" (same
    /// row) and "vertical" (same column) of a square lattice; in the order of <see cref="Edges"/>.
    /// </summary>
    public IReadOnlyList<(int A, int B)> BondsOfKind(string kind)
    {
        ArgumentNullException.ThrowIfNull(kind);
        return kind switch
        {
            "rungs" when Kind == "ladder" => Edges.Where(e => e.A / 2 == e.B / 2).ToArray(),
            "legs" when Kind == "ladder" => Edges.Where(e => e.A / 2 != e.B / 2).ToArray(),
            "horizontal" when Kind == "square" => Edges.Where(e => e.A / Width == e.B / Width).ToArray(),
            "vertical" when Kind == "square" => Edges.Where(e => e.A / Width != e.B / Width).ToArray(),
            _ => throw new ArgumentException($"No bonds of kind '{kind}' on a {Kind} lattice.", nameof(kind)),
        };
    }

    /// <summary>Distances from one site to all sites (breadth-first search; cached).</summary>
    public IReadOnlyList<int> DistancesFrom(int site)
    {
        ArgumentOutOfRangeException.ThrowIfNegative(site);
        ArgumentOutOfRangeException.ThrowIfGreaterThanOrEqual(site, N);
        var row = _rows[site];
        if (row is not null) return row;
        row = new int[N];
        if (Kind is "chain" or "ring" or "square" or "all-to-all")
        {
            for (int j = 0; j < N; j++) row[j] = Distance(site, j);
        }
        else
        {
            Array.Fill(row, int.MaxValue);
            row[site] = 0;
            var queue = new Queue<int>();
            queue.Enqueue(site);
            while (queue.Count > 0)
            {
                int a = queue.Dequeue();
                foreach (int b in _adjacency[a])
                {
                    if (row[b] != int.MaxValue) continue;
                    row[b] = row[a] + 1;
                    queue.Enqueue(b);
                }
            }
        }
        _rows[site] = row; // benign race: every writer stores the same content
        return row;
    }

    /// <summary>Open (or periodic: a ring) chain of n sites.</summary>
    public static Lattice Chain(int n, bool periodic = false)
    {
        ArgumentOutOfRangeException.ThrowIfLessThan(n, 1);
        var edges = new List<(int, int)>();
        for (int i = 0; i + 1 < n; i++) edges.Add((i, i + 1));
        if (periodic && n > 2) edges.Add((n - 1, 0));
        return new Lattice(periodic ? "ring" : "chain", n, periodic, n, 1, edges, []);
    }

    /// <summary>Two-leg ladder with <paramref name="length"/> rungs (2 * length sites).</summary>
    public static Lattice Ladder(int length, bool periodic = false)
    {
        ArgumentOutOfRangeException.ThrowIfLessThan(length, 1);
        var edges = new List<(int, int)>();
        var plaq = new List<int[]>();
        bool wrap = periodic && length > 2;
        for (int x = 0; x < length; x++)
        {
            edges.Add((2 * x, 2 * x + 1));
            int nx = x + 1 < length ? x + 1 : wrap ? 0 : -1;
            if (nx < 0) continue;
            edges.Add((2 * x, 2 * nx));
            edges.Add((2 * x + 1, 2 * nx + 1));
            plaq.Add([2 * x, 2 * nx, 2 * nx + 1, 2 * x + 1]);
        }
        return new Lattice("ladder", 2 * length, wrap, length, 2, edges, plaq);
    }

    /// <summary>Square lattice, width x height, row-major sites.</summary>
    public static Lattice Square(int width, int height, bool periodic = false)
    {
        ArgumentOutOfRangeException.ThrowIfLessThan(width, 1);
        ArgumentOutOfRangeException.ThrowIfLessThan(height, 1);
        var edges = new List<(int, int)>();
        var seen = new HashSet<(int, int)>();
        var plaq = new List<int[]>();
        bool wrapX = periodic && width > 2, wrapY = periodic && height > 2;
        void Add(int a, int b)
        {
            if (a != b && seen.Add((Math.Min(a, b), Math.Max(a, b)))) edges.Add((a, b));
        }
        for (int y = 0; y < height; y++)
        {
            for (int x = 0; x < width; x++)
            {
                int s = y * width + x;
                int nx = x + 1 < width ? x + 1 : wrapX ? 0 : -1;
                int ny = y + 1 < height ? y + 1 : wrapY ? 0 : -1;
                if (nx >= 0) Add(s, y * width + nx);
                if (ny >= 0) Add(s, ny * width + x);
                if (nx >= 0 && ny >= 0) plaq.Add([s, y * width + nx, ny * width + nx, ny * width + x]);
            }
        }
        return new Lattice("square", width * height, wrapX || wrapY, width, height, edges, plaq);
    }

    /// <summary>All-to-all cluster: every pair is a bond, every distance 1.</summary>
    public static Lattice AllToAll(int n)
    {
        ArgumentOutOfRangeException.ThrowIfLessThan(n, 1);
        var edges = new List<(int, int)>();
        for (int i = 0; i < n; i++)
        {
            for (int j = i + 1; j < n; j++) edges.Add((i, j));
        }
        return new Lattice("all-to-all", n, false, n, 1, edges, []);
    }

    /// <summary>Explicit edge list on n sites (the caller checks that it is connected and has no repeats or loops).</summary>
    public static Lattice FromEdges(int n, IEnumerable<(int A, int B)> edges)
    {
        ArgumentOutOfRangeException.ThrowIfLessThan(n, 1);
        var list = edges.ToList();
        foreach (var (a, b) in list)
        {
            if (a < 0 || a >= n || b < 0 || b >= n || a == b) throw new ArgumentException($"Edge ({a}, {b}) is not a pair of distinct sites in 0..{n - 1}.", nameof(edges));
        }
        return new Lattice("edges", n, false, n, 1, list, []);
    }

    /// <summary>True when every site can be reached from site 0.</summary>
    public bool IsConnected => DistancesFrom(0).All(d => d != int.MaxValue);

    public override string ToString() => Kind switch
    {
        "square" => $"square {Width}x{Height}{(Periodic ? " periodic" : " open")}, {N} sites, {Edges.Count} bonds",
        "ladder" => $"ladder of {Width} rungs{(Periodic ? " periodic" : "")}, {N} sites, {Edges.Count} bonds",
        _ => $"{Kind}, {N} sites, {Edges.Count} bonds",
    };
}
