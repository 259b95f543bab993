package settle.reports.stats;

import java.util.ArrayList;
import java.util.Arrays;
import java.util.List;

/**
 * The verdict on one per-replicate metric: every arm against the baseline, paired by seed.
 *
 * <ol>
 *   <li>On the {@link Scale#LOG_RATIO} scale values below the floor are raised to it and d_k = log(arm_k /
 *       baseline_k); on the {@link Scale#POINTS} scale (a fraction such as accuracy) d_k = arm_k − baseline_k.</li>
 *   <li>Pairs where both replicates diverged are dropped and counted. A pair where only one diverged
 *       counts the diverged side as worse than every finite value: d_k = ±∞ with the sign of "the arm
 *       is worse" (+∞ for lower-is-better metrics when the arm diverged), so such pairs take the
 *       largest ranks with that sign.</li>
 *   <li>Exact Wilcoxon signed-rank test on d (zeros dropped and counted, midranks for ties), then Bonferroni
 *       across the m arms ({@link Multiplicity}).</li>
 *   <li>Effect: Hodges–Lehmann estimate of d over the finite pairs, its exact interval and a percentile
 *       bootstrap interval, both at level 1 − (1 − c)/m, adjusted like the p; the pairs with a diverged
 *       replicate are set aside and counted.</li>
 *   <li>Probability of beating the baseline on a random seed: over the pairs not both diverged, the
 *       fraction where the arm is better (a diverged side always loses), ties counting ½.</li>
 * </ol>
 */
public final class Verdict {

    private Verdict() {
    }

    /**
     * @param metric metric name as shown in sentences
     * @param direction which way the metric improves
     * @param scale how paired values are compared
     * @param baseline the baseline arm's values
     * @param arms the other arms, each with as many replicates as the baseline
     * @param options floor, levels, bootstrap settings
     * @return one comparison per arm, in the order given, with adjusted p-values and intervals
     */
    public static List<Comparison> compare(String metric, Direction direction, Scale scale, ArmValues baseline,
            List<ArmValues> arms, VerdictOptions options) {
        return compare(metric, direction, scale, baseline, arms, options, true);
    }

    /**
     * As {@link #compare(String, Direction, Scale, ArmValues, List, VerdictOptions)}, with the percentile bootstrap
     * interval only when asked (descriptive metrics may leave it out: it is the costly part). The arms'
     * bootstrap intervals are computed in parallel; each depends only on its own pairs and the fixed seed,
     * so the result is the same at any thread count.
     *
     * @param bootstrap compute the bootstrap interval; when false it is {@link Interval#none(double)}
     */
    public static List<Comparison> compare(String metric, Direction direction, Scale scale, ArmValues baseline,
            List<ArmValues> arms, VerdictOptions options, boolean bootstrap) {
        if (arms.isEmpty()) {
            throw new IllegalArgumentException("metric '" + metric + "': no arm to compare with the baseline '"
                    + baseline.name() + "'");
        }
        int m = arms.size();
        Partial[] partial = new Partial[m];
        double[] raw = new double[m];
        for (int a = 0; a < m; a++) {
            ArmValues arm = arms.get(a);
            if (arm.size() != baseline.size()) {
                throw new IllegalArgumentException("metric '" + metric + "': arm '" + arm.name() + "' has "
                        + arm.size() + " replicates but the baseline '" + baseline.name() + "' has "
                        + baseline.size());
            }
            partial[a] = pairUp(direction, scale, baseline, arm, options);
            raw[a] = partial[a].test.pValue();
        }
        double[] adjusted = Multiplicity.adjust(raw);
        int needed = Multiplicity.pairsNeeded(m, options.significance());
        double level = Multiplicity.level(options.confidence(), m);
        Interval[] boots = new Interval[m];
        java.util.stream.IntStream.range(0, m).parallel().forEach(a -> {
            double[] finite = partial[a].finiteLogRatios;
            boots[a] = finite.length == 0 || !bootstrap ? Interval.none(level)
                    : Bootstrap.hodgesLehmannInterval(finite, options.seed(), options.resamples(), level);
        });
        List<Comparison> out = new ArrayList<>(m);
        for (int a = 0; a < m; a++) {
            Partial q = partial[a];
            double[] finite = q.finiteLogRatios;
            double estimate = finite.length == 0 ? Double.NaN : HodgesLehmann.estimate(finite);
            Interval exact = finite.length == 0 ? Interval.none(0.0) : HodgesLehmann.exactInterval(finite, level);
            Interval boot = boots[a];
            out.add(new Comparison(metric, arms.get(a).name(), baseline.name(), direction, scale, baseline.size(),
                    q.bothDiverged, q.armDiverged, q.baselineDiverged, q.clamped, options.floor(),
                    q.test.zeros(), q.test.used(), q.test.statistic(), q.test.pValue(), adjusted[a], m,
                    finite.length, estimate, exact, boot, q.probabilityBetter,
                    Multiplicity.smallestAdjustedP(m, q.test.used()), needed, options.significance(), level));
        }
        return out;
    }

    private record Partial(int bothDiverged, int armDiverged, int baselineDiverged, int clamped,
            double[] finiteLogRatios, SignedRankResult test, double probabilityBetter) {
    }

    private static Partial pairUp(Direction direction, Scale scale, ArmValues baseline, ArmValues arm,
            VerdictOptions options) {
        int n = baseline.size();
        double worse = direction == Direction.LOWER_IS_BETTER ? Double.POSITIVE_INFINITY : Double.NEGATIVE_INFINITY;
        double floor = options.floor();
        int both = 0;
        int armOnly = 0;
        int baseOnly = 0;
        int clamped = 0;
        int finiteCount = 0;
        double wins = 0.0;
        double[] differences = new double[n];
        double[] finite = new double[n];
        int used = 0;
        for (int k = 0; k < n; k++) {
            boolean ad = arm.isDiverged(k);
            boolean bd = baseline.isDiverged(k);
            if (ad && bd) {
                both++;
                continue;
            }
            if (ad) {
                armOnly++;
                differences[used++] = worse;
                continue;
            }
            if (bd) {
                baseOnly++;
                differences[used++] = -worse;
                wins += 1.0;
                continue;
            }
            double a = arm.value(k);
            double b = baseline.value(k);
            if (scale == Scale.LOG_RATIO) {
                if (a < floor) {
                    a = floor;
                    clamped++;
                }
                if (b < floor) {
                    b = floor;
                    clamped++;
                }
            }
            double d = a == b ? 0.0 : scale == Scale.LOG_RATIO ? Math.log(a / b) : a - b;
            differences[used++] = d;
            finite[finiteCount++] = d;
            if (d == 0.0) {
                wins += 0.5;
            } else if ((a < b) == (direction == Direction.LOWER_IS_BETTER)) {
                wins += 1.0;
            }
        }
        double[] tested = Arrays.copyOf(differences, used);
        double[] finiteRatios = Arrays.copyOf(finite, finiteCount);
        SignedRankResult test = SignedRankTest.test(tested);
        double probability = used == 0 ? Double.NaN : wins / used;
        return new Partial(both, armOnly, baseOnly, clamped, finiteRatios, test, probability);
    }
}
