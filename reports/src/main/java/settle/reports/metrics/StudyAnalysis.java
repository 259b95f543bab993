package settle.reports.metrics;

import java.util.ArrayList;
import java.util.EnumMap;
import java.util.List;
import java.util.Map;
import settle.reports.stats.ArmSummary;
import settle.reports.stats.ArmValues;
import settle.reports.stats.Comparison;
import settle.reports.stats.Direction;
import settle.reports.stats.Multiplicity;
import settle.reports.stats.Interval;
import settle.reports.stats.Jackknife;
import settle.reports.stats.Scale;
import settle.reports.stats.Verdict;
import settle.reports.stats.VerdictOptions;
import settle.reports.format.Metric;
import settle.reports.format.Replicate;
import settle.reports.format.Study;

/**
 * Everything a report shows that spans replicates: per-arm summaries of every per-replicate metric, the
 * verdict (each arm against the baseline, paired by replicate index; the primary metric is where the returned
 * iterate ends: its final gap F(θ_ret) − F(θ*) for convex models, its final training objective otherwise; the rest
 * descriptive), and the arm-level metrics with jackknife intervals.
 *
 * <p>Pairing: the verdict uses the replicate indices whose file exists in every arm (a partial study drops
 * the others, counted in {@link #pairedReplicates()}); a diverged replicate counts as worst. Arm summaries use
 * each arm's finished replicates.
 */
public final class StudyAnalysis {

    /** The metrics of the verdict of a convex model, primary first. */
    private static final List<Metric> COMPARED_CONVEX = List.of(Metric.FINAL_GAP, Metric.FINAL_DISTANCE,
            Metric.TAIL_RADIUS, Metric.TEST_LOSS, Metric.TEST_ACCURACY, Metric.AVERAGED_GAP);
    /** The metrics of the verdict without a reference minimiser, primary first. */
    private static final List<Metric> COMPARED_OTHER = List.of(Metric.FINAL_OBJECTIVE, Metric.TAIL_RADIUS,
            Metric.TEST_LOSS, Metric.TEST_ACCURACY);

    private final Study study;
    private final VerdictOptions options;
    private final List<Metric> available;
    private final Map<Metric, ArmSummary[]> summaries = new EnumMap<>(Metric.class);
    private final Map<Metric, List<Comparison>> comparisons = new EnumMap<>(Metric.class);
    private final int[] paired;
    private final ArmLevel[] seedSpread;
    private final ArmLevel[] predictionSpread;
    private final ArmLevel[] disagreement;
    private VerdictSummary verdict;
    private ClassBalance classBalance;
    private boolean classBalanceDone;

    private StudyAnalysis(Study study, VerdictOptions options) {
        this.study = study;
        this.options = options;
        int arms = study.armCount();
        this.paired = pairedIndices(study);
        this.available = new ArrayList<>();
        for (Metric m : Metric.values()) {
            if (metricAvailable(study, m)) {
                available.add(m);
            }
        }
        for (Metric m : available) {
            ArmSummary[] s = new ArmSummary[arms];
            for (int a = 0; a < arms; a++) {
                s[a] = summary(study, a, m);
            }
            summaries.put(m, s);
        }
        int base = study.manifest().baselineIndex();
        if (arms > 1 && paired.length > 0) {
            for (Metric m : compared()) {
                if (!available.contains(m)) {
                    continue;
                }
                ArmValues baseline = values(study, base, m, paired);
                List<ArmValues> others = new ArrayList<>();
                for (int a = 0; a < arms; a++) {
                    if (a != base) {
                        others.add(values(study, a, m, paired));
                    }
                }
                comparisons.put(m, Verdict.compare(m.words(), m.higherIsBetter() ? Direction.HIGHER_IS_BETTER
                        : Direction.LOWER_IS_BETTER, m == Metric.TEST_ACCURACY ? Scale.POINTS : Scale.LOG_RATIO,
                        baseline, others, options, m == primary()));
            }
        }
        this.seedSpread = new ArmLevel[arms];
        this.predictionSpread = new ArmLevel[arms];
        this.disagreement = new ArmLevel[arms];
        armLevel();
    }

    /**
     * @param study the study
     * @param options the verdict's settings
     * @return the analysis
     */
    public static StudyAnalysis of(Study study, VerdictOptions options) {
        return new StudyAnalysis(study, options);
    }

    /** @return the analysis with the default verdict settings */
    public static StudyAnalysis of(Study study) {
        return of(study, VerdictOptions.defaults());
    }

    /**
     * @return the primary metric: how far the returned iterate (θ_T, or the tail mean of an averaged arm) ends
     *     from the minimum, its final gap for a convex model, its final training objective otherwise
     */
    public Metric primary() {
        return study.convex() ? Metric.FINAL_GAP : Metric.FINAL_OBJECTIVE;
    }

    /** @return the metrics of the verdict, primary first */
    public List<Metric> compared() {
        return study.convex() ? COMPARED_CONVEX : COMPARED_OTHER;
    }

    /** @return the verdict in words (computed once, on first use) */
    public VerdictSummary verdict() {
        if (verdict == null) {
            verdict = VerdictSummary.of(this);
        }
        return verdict;
    }

    /**
     * @return balanced accuracy and per-class recall per arm with their comparisons (computed once, on first use), or
     *     null when the study records no test labels
     */
    public ClassBalance classBalance() {
        if (!classBalanceDone) {
            classBalance = ClassBalance.of(study, paired, options);
            classBalanceDone = true;
        }
        return classBalance;
    }

    /** @return the study analysed */
    public Study study() {
        return study;
    }

    /** @return the verdict settings */
    public VerdictOptions options() {
        return options;
    }

    /** @return the per-replicate metrics every finished replicate has, in enum order */
    public List<Metric> available() {
        return List.copyOf(available);
    }

    /** @return the summary of metric {@code m} for every arm (index = arm index − 1), or null when unavailable */
    public ArmSummary[] summaries(Metric m) {
        ArmSummary[] s = summaries.get(m);
        return s == null ? null : s.clone();
    }

    /**
     * @return each arm's median of metric {@code m} over its finished replicates, by arm index (NaN for an arm with
     *     none, and for every arm when the metric is unavailable)
     */
    public double[] medians(Metric m) {
        double[] out = new double[study.armCount()];
        ArmSummary[] s = summaries.get(m);
        for (int a = 0; a < out.length; a++) {
            out[a] = s == null ? Double.NaN : s[a].median();
        }
        return out;
    }

    /**
     * @return the comparisons of every non-baseline arm with the baseline on {@code m}, in arm order; empty
     *     when the metric is unavailable or the study has one arm
     */
    public List<Comparison> comparisons(Metric m) {
        return comparisons.getOrDefault(m, List.of());
    }

    /** @return the comparison of arm {@code arm} (0-based) on {@code m}, or null for the baseline or none */
    public Comparison comparison(Metric m, int arm) {
        List<Comparison> list = comparisons(m);
        int base = study.manifest().baselineIndex();
        if (arm == base || list.isEmpty()) {
            return null;
        }
        return list.get(arm < base ? arm : arm - 1);
    }

    /** @return the 0-based replicate indices present in every arm: the pairs of the verdict */
    public int[] pairedReplicates() {
        return paired.clone();
    }

    /** @return m, the number of arms compared with the baseline */
    public int comparedArms() {
        return study.armCount() - 1;
    }

    /** @return the replicates a verdict needs for adjusted p ≤ the significance level at this m */
    public int replicatesNeeded() {
        return Multiplicity.pairsNeeded(Math.max(1, comparedArms()), options.significance());
    }

    /** @return seed spread of arm {@code a} (convex models; else undefined) */
    public ArmLevel seedSpread(int a) {
        return seedSpread[a];
    }

    /** @return prediction spread of arm {@code a} */
    public ArmLevel predictionSpread(int a) {
        return predictionSpread[a];
    }

    /** @return mean pairwise disagreement of arm {@code a} */
    public ArmLevel disagreement(int a) {
        return disagreement[a];
    }

    private static int[] pairedIndices(Study study) {
        List<Integer> keep = new ArrayList<>();
        for (int k = 0; k < study.replicateCount(); k++) {
            boolean all = true;
            for (int a = 0; a < study.armCount() && all; a++) {
                all = study.replicate(a, k) != null;
            }
            if (all) {
                keep.add(k);
            }
        }
        return keep.stream().mapToInt(Integer::intValue).toArray();
    }

    private static boolean metricAvailable(Study study, Metric m) {
        if (m.convexOnly() && !study.convex()) {
            return false;
        }
        boolean any = false;
        for (int a = 0; a < study.armCount(); a++) {
            for (int k = 0; k < study.replicateCount(); k++) {
                Replicate r = study.replicate(a, k);
                if (r == null || r.diverged()) {
                    continue;
                }
                if (!Double.isFinite(r.metric(m))) {
                    return false;
                }
                any = true;
            }
        }
        return any;
    }

    private static ArmSummary summary(Study study, int a, Metric m) {
        List<Replicate> present = new ArrayList<>();
        for (Replicate r : study.replicates().get(a)) {
            if (r != null) {
                present.add(r);
            }
        }
        double[] v = new double[present.size()];
        boolean[] d = new boolean[present.size()];
        for (int i = 0; i < v.length; i++) {
            d[i] = present.get(i).diverged();
            v[i] = d[i] ? Double.NaN : present.get(i).metric(m);
        }
        return ArmSummary.of(v, d);
    }

    private static ArmValues values(Study study, int a, Metric m, int[] indices) {
        double[] v = new double[indices.length];
        boolean[] d = new boolean[indices.length];
        for (int i = 0; i < indices.length; i++) {
            Replicate r = study.replicate(a, indices[i]);
            d[i] = r.diverged();
            v[i] = d[i] ? Double.NaN : r.metric(m);
        }
        return new ArmValues(study.armName(a), v, d);
    }

    /**
     * Seed spread, prediction spread and disagreement over each arm's finished replicates, as means over distinct
     * pairs of replicates ({@link Spread}), each with its jackknife interval at the nominal level
     * ({@link Jackknife}; three finished replicates at least).
     */
    private void armLevel() {
        int arms = study.armCount();
        GaugeProjection gauge = gauge();
        for (int a = 0; a < arms; a++) {
            List<Replicate> finished = new ArrayList<>();
            for (Replicate r : study.replicates().get(a)) {
                if (r != null && !r.diverged()) {
                    finished.add(r);
                }
            }
            int n = finished.size();
            seedSpread[a] = ArmLevel.none();
            predictionSpread[a] = ArmLevel.none();
            disagreement[a] = ArmLevel.none();
            if (n < 2) {
                continue;
            }
            if (study.convex()) {
                double[][] theta = new double[n][];
                for (int i = 0; i < n; i++) {
                    theta[i] = gauge.project(finished.get(i).finalIterate());
                }
                Spread.PairMeans m = Spread.pairMeans(Spread.halfSquaredDistances(theta, 1.0), n);
                double[] roots = m.leaveOneOut();
                for (int i = 0; i < roots.length; i++) {
                    roots[i] = Math.sqrt(roots[i]);
                }
                seedSpread[a] = level(Math.sqrt(m.value()), roots, n);
            }
            boolean probabilities = true;
            for (Replicate r : finished) {
                probabilities &= r.testProbabilities() != null;
            }
            if (probabilities) {
                double[][] p = new double[n][];
                int[][] predicted = new int[n][];
                for (int i = 0; i < n; i++) {
                    p[i] = finished.get(i).testProbabilities();
                    predicted[i] = finished.get(i).testPredicted();
                }
                int rows = finished.get(0).testRows();
                Spread.PairMeans spread = Spread.pairMeans(Spread.halfSquaredDistances(p, rows), n);
                predictionSpread[a] = level(spread.value(), spread.leaveOneOut(), n);
                Spread.PairMeans differ = Spread.pairMeans(Spread.disagreement(predicted), n);
                disagreement[a] = level(differ.value(), differ.leaveOneOut(), n);
            }
        }
    }

    private ArmLevel level(double value, double[] leaveOneOut, int replicates) {
        return new ArmLevel(value, Jackknife.interval(value, leaveOneOut, options.confidence()), replicates);
    }

    /** @return the gauge of the study's model: weights centred too when its penalty λ (the manifest's) is 0 */
    private GaugeProjection gauge() {
        var m = study.manifest();
        int gaugeDimension = study.reference() == null ? -1 : study.reference().gaugeDimension();
        return GaugeProjection.of(m.parameters(), m.featureNames().size(), m.classes(), gaugeDimension, m.l2() == 0.0);
    }
}
