using OpGrowth.Evolution;
using OpGrowth.Pauli;

namespace OpGrowth.Benchmarks;

/// <summary>Shared benchmark inputs.</summary>
public static class Workloads
{
    /// <summary>Mixed-field Ising chain H = J sum Z Z + g sum X + h sum Z on n open sites.</summary>
    public static Hamiltonian MixedFieldIsing(int n, double j = 1.0, double g = 1.05, double h = 0.5)
    {
        var terms = new List<PauliTerm>();
        for (int i = 0; i + 1 < n; i++) terms.Add(new PauliTerm(PauliString.Parse($"Z_{i} Z_{i + 1}", n), j));
        for (int i = 0; i < n; i++)
        {
            terms.Add(new PauliTerm(PauliString.Single(n, i, 'X'), g));
            terms.Add(new PauliTerm(PauliString.Single(n, i, 'Z'), h));
        }
        return new Hamiltonian(n, terms);
    }

    /// <summary>The operator after <paramref name="steps"/> normalised commutators from Z at the centre.</summary>
    public static (CompiledHamiltonian<Pauli64>, PauliOperator<Pauli64>) GrownMixedFieldIsing(int n, int steps)
    {
        var h = MixedFieldIsing(n).Compile<Pauli64>();
        var o = PauliOperator<Pauli64>.Single(PauliString.Single(n, n / 2, 'Z'));
        for (int s = 0; s < steps; s++)
        {
            o = Liouvillian.Commutator(h, o, Environment.ProcessorCount);
            o.Scale(1 / o.Norm());
        }
        return (h, o);
    }

    /// <summary>Number of anticommuting (term, string) pairs.</summary>
    public static long CountProducts(CompiledHamiltonian<Pauli64> h, PauliOperator<Pauli64> o)
    {
        long c = 0;
        foreach (var k in o.Keys)
        {
            foreach (var t in h.Keys)
            {
                if (Pauli64.Anticommute(t, k)) c++;
            }
        }
        return c;
    }

    /// <summary>The evolution workload: mixed-field Ising chain on 128 sites, probe Z_64.</summary>
    public static EvolutionProblem MixedFieldIsingProblem128()
    {
        const int n = 128;
        var terms = new List<PauliTerm>();
        for (int i = 0; i + 1 < n; i++) terms.Add(new PauliTerm(new PauliString.Builder(n).Set(i, 'Z').Set(i + 1, 'Z').Build(), 1.0));
        for (int i = 0; i < n; i++) terms.Add(new PauliTerm(PauliString.Single(n, i, 'X'), 1.05));
        for (int i = 0; i < n; i++) terms.Add(new PauliTerm(PauliString.Single(n, i, 'Z'), 0.5));
        return new EvolutionProblem { N = n, Hamiltonian = new Hamiltonian(n, terms), Initial = EvolutionProblem.Probe(PauliString.Single(n, 64, 'Z')) };
    }
}
