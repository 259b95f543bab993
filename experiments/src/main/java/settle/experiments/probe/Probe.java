package settle.experiments.probe;

import java.util.ArrayList;
import java.util.Arrays;
import java.util.List;
import java.util.Optional;
import settle.engine.minimum.Curvature;
import settle.engine.minimum.Minimiser;
import settle.engine.minimum.Minimum;
import settle.engine.minimum.NoMinimiserException;
import settle.engine.model.Initialisation;
import settle.engine.model.Model;
import settle.engine.probe.RangeRule;
import settle.engine.probe.RangeTest;
import settle.engine.train.ReplicateSeeds;
import settle.experiments.plan.ParsedPlan;
import settle.experiments.plan.Plan;
import settle.experiments.plan.PlanData;
import settle.input.BadInputException;

/**
 * {@code settle probe}'s computation: a learning-rate range test ({@link RangeTest}) on a plan's training
 * split and model, one sweep per seed (replicates 1..S of the plan's root seed, so the sweeps start where the
 * study's replicates start), and the suggested initial-rate range read from it.
 *
 * <p>For convex models the stability bound of the mean iterate at θ*, 2/λmax(H) (2(1 + β)/λmax(H) with heavy-ball
 * momentum β), is computed first and is each sweep's ceiling: at or above it a constant rate leaves the mean iterate
 * oscillating or growing along H's top eigen-direction, so no such rate is tried or suggested. Each sweep is read by
 * {@link RangeRule}; the suggested range is the median over the seeds of the sweeps' lower ends to the median of their
 * upper ends (a sweep without a range, one that never went below its start, counts in neither), the upper end held
 * strictly below the bound (the sweep's largest grid rate under it). Non-convex models have no bound.
 */
public final class Probe {

    /**
     * What a probe found.
     *
     * @param sweeps one per seed, seed k = replicate k
     * @param ranges each sweep's reading ({@link RangeRule})
     * @param lower the lower end of the suggested range: the median of the sweeps' lower ends (NaN when no sweep has a
     *     range)
     * @param upper the upper end: the median of the sweeps' upper ends, held strictly below {@code stabilityBound}
     * @param capped whether the bound set the upper end: it is the sweep grid's largest rate below the bound (the
     *     sweeps were still at their best when they reached the bound)
     * @param stabilityBound 2(1 + β)/λmax(H) at θ* for convex models, NaN otherwise
     * @param boundNote why the bound is missing, or ""
     * @param momentum the plan's heavy-ball β (the bound's formula depends on it)
     */
    public record Result(List<RangeTest.Sweep> sweeps, List<RangeRule.Range> ranges, double lower, double upper,
            boolean capped, double stabilityBound, String boundNote, double from, double to, int updates,
            double momentum) {

        public Result {
            sweeps = List.copyOf(sweeps);
            ranges = List.copyOf(ranges);
        }

        /** @return how many sweeps have a range */
        public int withRange() {
            return (int) ranges.stream().filter(RangeRule.Range::exists).count();
        }

        /** @return whether the sweeps' first rate is already at or above the bound, so nothing could be tried */
        public boolean startsAboveBound() {
            return from >= stabilityBound;
        }

        /**
         * @return one plain line (lower case first) saying that the stability bound set the upper end, and why; ""
         *     when it did not
         */
        public String capLine() {
            if (startsAboveBound()) {
                return "no rate tried: the sweep's first rate " + ProbePage.num(from) + " is at or above the stability"
                        + " bound " + Curvature.boundFormula(momentum) + " = " + ProbePage.num(stabilityBound)
                        + "; start the sweep lower (--from)";
            }
            if (!capped) {
                return "";
            }
            return "upper end held below the stability bound " + Curvature.boundFormula(momentum) + " = "
                    + ProbePage.num(stabilityBound) + ": the sweeps were still at their lowest objective when they"
                    + " reached it, and at or above it the mean iterate does not settle along H's top direction";
        }
    }

    private Probe() {
    }

    /**
     * Runs the probe.
     *
     * @param seeds S, the sweeps (replicates 1..S)
     * @param from the first rate of each sweep
     * @param to the top of each sweep
     * @param updates the sweep length
     */
    public static Result run(ParsedPlan parsed, int seeds, double from, double to, int updates) {
        Plan plan = parsed.plan();
        if (seeds < 1 || seeds > 1000) {
            throw BadInputException.of("--seeds", "--seeds must be in 1..1000, got " + seeds);
        }
        if (updates < 10 || updates > 1_000_000) {
            throw BadInputException.of("--updates", "--updates must be in 10..1000000, got " + updates);
        }
        if (!(from > 0) || !(to > from) || to == Double.POSITIVE_INFINITY) {
            throw BadInputException.of("--from", "the sweep needs 0 < --from < --to < ∞, got " + from + " and " + to);
        }
        PlanData data = PlanData.load(parsed);
        Model model;
        try {
            model = plan.model().build(data.train().features(), data.train().classes());
        } catch (BadInputException e) {
            throw parsed.error("model", e.getMessage());
        }
        Initialisation init = plan.model().init();
        String boundNote = "";
        double bound = Double.NaN;
        Minimum minimum = null;
        if (model.convex()) {
            try {
                minimum = new Minimiser().minimise(model, data.train());
                Optional<String> skip = Curvature.skipReason(model);
                if (skip.isPresent()) {
                    boundNote = skip.get();
                } else {
                    bound = Curvature.at(model, data.train(), minimum.theta()).stabilityBound(plan.training().momentum());
                }
            } catch (NoMinimiserException e) {
                boundNote = e.getMessage();
            }
        } else {
            boundNote = "not convex: no reference minimiser";
        }
        if (init == Initialisation.REFERENCE) {
            // a sweep from θ* measures nothing about the start of training: sweep from zeros instead
            init = Initialisation.ZEROS;
        }
        // F(θ*) where the minimiser found it, else 0 (every objective settle fits is non-negative)
        double floor = minimum != null ? minimum.objective() : 0.0;
        RangeTest test = new RangeTest(model, data.train(), plan.training(), init, from, to, updates);
        List<RangeTest.Sweep> sweeps = new ArrayList<>();
        List<RangeRule.Range> ranges = new ArrayList<>();
        double[] lowers = new double[seeds];
        double[] uppers = new double[seeds];
        for (int k = 1; k <= seeds; k++) {
            RangeTest.Sweep s = test.run(ReplicateSeeds.derive(plan.seed(), k), bound, floor);
            RangeRule.Range range = s.range();
            sweeps.add(s);
            ranges.add(range);
            lowers[k - 1] = range.lower();
            uppers[k - 1] = range.upper();
        }
        double lower = median(lowers);
        double upper = median(uppers);
        boolean capped = false;
        if (Double.isFinite(bound)) {
            double below = largestRateBelow(test, updates, bound);
            capped = upper >= below;
            upper = Math.min(upper, below);
        }
        return new Result(sweeps, ranges, lower, upper, capped, bound, boundNote, from, to, updates,
                plan.training().momentum());
    }

    /**
     * @param updates the sweep's length
     * @return the largest rate of {@code test}'s geometric grid strictly below {@code bound}; NaN when its first rate
     *     is already at or above it
     */
    static double largestRateBelow(RangeTest test, int updates, double bound) {
        for (int t = updates; t >= 1; t--) {
            double rate = test.rate(t);
            if (rate < bound) {
                return rate;
            }
        }
        return Double.NaN;
    }

    /** @return the median of the finite values (NaN when none); not modified */
    static double median(double[] values) {
        double[] v = Arrays.stream(values).filter(Double::isFinite).sorted().toArray();
        if (v.length == 0) {
            return Double.NaN;
        }
        int n = v.length;
        return n % 2 == 1 ? v[n / 2] : 0.5 * (v[n / 2 - 1] + v[n / 2]);
    }
}
