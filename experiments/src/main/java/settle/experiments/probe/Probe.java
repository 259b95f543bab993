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
 * <p>Definitions. The largest stable rate of a sweep is the last rate before its objective blew up (or the
 * top of the sweep when it never did). The <b>upper end</b> of the suggested range is the median over the
 * seeds of their largest stable rates; the <b>lower end</b> is a tenth of it (a decade below: common
 * practice). For convex models the mean-stability bound 2/λmax(H) at θ* (2(1 + β)/λmax(H) with heavy-ball
 * momentum β) caps the range: when the median is at or above the bound, the upper end is instead the largest
 * rate of the sweep's own geometric grid strictly below the bound, since a constant rate at or above it leaves
 * the mean iterate oscillating or growing along H's top eigen-direction (the range test can survive such rates:
 * its sweep spends only a few updates at each). Non-convex models have no bound and no cap.
 */
public final class Probe {

    /** The lower end of the suggested range is the upper end divided by this. */
    public static final double DECADE = 10.0;

    /**
     * What a probe found.
     *
     * @param sweeps one per seed, seed k = replicate k
     * @param largestStable the largest stable rate of each sweep
     * @param medianStable the median of {@code largestStable}
     * @param upper the upper end of the suggested range: {@code medianStable}, or when {@code capped} the largest
     *     rate of the sweep's grid strictly below {@code stabilityBound} (NaN when the sweep starts at or above it)
     * @param lower {@code upper / 10}
     * @param capped whether {@code medianStable} was at or above {@code stabilityBound}, so the bound set the upper
     *     end
     * @param stabilityBound 2(1 + β)/λmax(H) at θ* for convex models, NaN otherwise
     * @param boundNote why the bound is missing, or ""
     * @param momentum the plan's heavy-ball β (the bound's formula depends on it)
     */
    public record Result(List<RangeTest.Sweep> sweeps, double[] largestStable, double medianStable, double upper,
            double lower, boolean capped, double stabilityBound, String boundNote, double from, double to, int updates,
            double momentum) {

        /**
         * @return one plain line (lower case first) saying that the stability bound set the upper end, and why; ""
         *     when it did not
         */
        public String capLine() {
            if (!capped) {
                return "";
            }
            String head = "suggested upper end capped at the stability bound " + Curvature.boundFormula(momentum) + " = "
                    + ProbePage.num(stabilityBound) + ": at or above it the mean iterate does not settle along H's top"
                    + " direction; the median largest stable rate, " + ProbePage.num(medianStable) + ", is at or above"
                    + " it, ";
            return Double.isFinite(upper)
                    ? head + "so the upper end is " + ProbePage.num(upper) + ", the sweep's largest rate below it"
                    : head + "and every rate of the sweep is too: start the sweep lower (--from)";
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
        RangeTest test = new RangeTest(model, data.train(), plan.training().settings(false), init, from, to, updates);
        List<RangeTest.Sweep> sweeps = new ArrayList<>();
        double[] stable = new double[seeds];
        for (int k = 1; k <= seeds; k++) {
            RangeTest.Sweep s = test.run(ReplicateSeeds.derive(plan.seed(), k));
            sweeps.add(s);
            stable[k - 1] = s.largestStableRate();
        }
        double median = median(stable);
        boolean capped = median >= bound;
        double upper = capped ? largestRateBelow(test, updates, bound) : median;
        return new Result(sweeps, stable, median, upper, upper / DECADE, capped, bound, boundNote, from, to, updates,
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
