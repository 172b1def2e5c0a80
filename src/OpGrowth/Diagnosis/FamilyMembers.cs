using System.Globalization;
using OpGrowth.IO;
using OpGrowth.Models;

namespace OpGrowth.Diagnosis;

/// <summary>Smaller members of a model family read from a model file, by changing its size parameters.</summary>
public static class FamilyMembers
{
    /// <summary>
    /// A <see cref="SmallerMember"/> for the model file at <paramref name="path"/> loaded with
    /// <paramref name="overrides"/>. The size parameters are the model's <see cref="Model.SizeParameters"/>
    /// (the file's <c>size</c> key, else <c>N</c>, else the parameters of the lattice's size keys). For a
    /// target of n sites the member is the largest one with at most n sites, found by changing one size
    /// parameter (the one that keeps the most sites; squares and ladders thus shrink along one direction),
    /// unless changing all of them together keeps more sites (then the most nearly proportional choice). For
    /// realisation r &gt; 0 the parameter <c>seed</c> is stepped by r. Members are loaded leniently: a term
    /// that places nothing at the smaller size is dropped and noted (<see cref="Model.LoadNotes"/>). Returns
    /// null when the file has no size parameter and the model is larger than n.
    /// </summary>
    public static SmallerMember FromFile(string path, IReadOnlyDictionary<string, string>? overrides, Model loaded)
    {
        ArgumentNullException.ThrowIfNull(path);
        ArgumentNullException.ThrowIfNull(loaded);
        var baseOverrides = overrides ?? new Dictionary<string, string>();
        var parameters = loaded.Parameters;
        var sizeParams = loaded.SizeParameters.Where(parameters.ContainsKey).ToArray();
        return (n, r) =>
        {
            Dictionary<string, string>? ov;
            if (loaded.N <= n) ov = new Dictionary<string, string>(baseOverrides);
            else if (sizeParams.Length == 0) return null;
            else ov = Shrink(path, baseOverrides, parameters, sizeParams, n);
            if (ov is null) return null;
            if (r > 0)
            {
                if (!parameters.TryGetValue("seed", out double seed)) return null;
                ov["seed"] = (seed + r).ToString(CultureInfo.InvariantCulture);
            }
            if (r == 0 && loaded.N <= n) return loaded;
            return ModelLoader.Load(path, ov, lenient: true);
        };
    }

    private static double Spread(Dictionary<string, double> values) => values.Values.Max() - values.Values.Min();

    /// <summary>Overrides that give the largest member with at most n sites, or null.</summary>
    internal static Dictionary<string, string>? Shrink(string path, IReadOnlyDictionary<string, string> baseOverrides, IReadOnlyDictionary<string, double> parameters, IReadOnlyList<string> sizeParams, int n)
    {
        int Sites(IReadOnlyDictionary<string, double> values)
        {
            var ov = new Dictionary<string, string>(baseOverrides);
            foreach (var (k, v) in values) ov[k] = v.ToString(CultureInfo.InvariantCulture);
            try
            {
                return ModelLoader.CountSites(path, ov);
            }
            catch (InputException)
            {
                return int.MaxValue; // not a valid member (e.g. a lattice too small for its kind)
            }
        }
        var current = sizeParams.ToDictionary(p => p, p => Math.Round(parameters[p]));
        Dictionary<string, double>? best = null;
        int bestSites = 0;
        bool bestJoint = true;
        // One parameter at a time (largest member first): binary search for the largest value that fits,
        // assuming the number of sites grows with each size parameter.
        foreach (var p in sizeParams)
        {
            double hi = current[p];
            if (hi < 1) continue;
            double lo = 1;
            var trial = new Dictionary<string, double>(current);
            trial[p] = lo;
            if (Sites(trial) > n) continue;
            while (hi - lo > 1)
            {
                double mid = Math.Floor((lo + hi) / 2);
                trial[p] = mid;
                if (Sites(trial) <= n) lo = mid;
                else hi = mid;
            }
            trial[p] = lo;
            int sites = Sites(trial);
            if (sites <= n && (sites > bestSites || (sites == bestSites && bestJoint)))
            {
                best = trial;
                bestSites = sites;
                bestJoint = false;
            }
        }
        if (sizeParams.Count > 1)
        {
            // every combination of smaller values when there are few (e.g. 4 x 4 -> 3 x 2 for six sites), else
            // all parameters scaled together
            long combos = sizeParams.Aggregate(1L, (acc, p) => acc * (long)Math.Max(1, current[p]));
            var trials = new List<Dictionary<string, double>>();
            if (combos <= 400)
            {
                trials.Add(new Dictionary<string, double>());
                foreach (var p in sizeParams)
                {
                    trials = trials.SelectMany(t => Enumerable.Range(1, (int)Math.Max(1, current[p])).Select(v => new Dictionary<string, double>(t) { [p] = v })).ToList();
                }
            }
            else
            {
                for (double f = 0.95; f > 0.02; f -= 0.05) trials.Add(current.ToDictionary(kv => kv.Key, kv => Math.Max(1, Math.Floor(kv.Value * f))));
            }
            foreach (var trial in trials)
            {
                int sites = Sites(trial);
                if (sites > n || sites < bestSites) continue;
                if (sites == bestSites && best is not null && !bestJoint) continue; // one direction shrunk wins a tie
                if (sites == bestSites && best is not null && Spread(trial) >= Spread(best)) continue;
                best = trial;
                bestSites = sites;
                bestJoint = true;
            }
        }
        if (best is null) return null;
        var result = new Dictionary<string, string>(baseOverrides);
        foreach (var (k, v) in best) result[k] = v.ToString(CultureInfo.InvariantCulture);
        return result;
    }
}
