package settle.experiments.cli;

import java.io.PrintWriter;
import java.math.BigDecimal;
import java.math.MathContext;
import java.math.RoundingMode;
import java.nio.file.Path;
import java.util.ArrayList;
import java.util.List;
import java.util.Locale;
import java.util.Optional;
import java.util.TreeMap;
import java.util.concurrent.Callable;
import picocli.CommandLine.Command;
import picocli.CommandLine.Model.CommandSpec;
import picocli.CommandLine.Parameters;
import picocli.CommandLine.Spec;
import settle.datasets.Dataset;
import settle.engine.minimum.Curvature;
import settle.engine.minimum.Minimiser;
import settle.engine.minimum.Minimum;
import settle.engine.minimum.NoMinimiserException;
import settle.engine.model.Model;
import settle.engine.schedule.Asymptotics;
import settle.engine.schedule.RateSums;
import settle.engine.schedule.RunShape;
import settle.experiments.study.StudyContext;
import settle.input.BadInputException;
import settle.experiments.plan.ArmPlan;
import settle.experiments.plan.ParsedPlan;
import settle.experiments.plan.Plan;
import settle.experiments.plan.PlanData;
import settle.experiments.plan.PlanParser;
import settle.experiments.plan.PlanWriter;
import settle.experiments.study.AprioriBound;
import settle.reports.metrics.ClassBalance;
import settle.reports.stats.Multiplicity;
import settle.reports.text.Names;
import settle.reports.stats.VerdictOptions;

/**
 * {@code settle check PLAN}: validates a plan, prints it resolved, loads and splits its data (a CSV table's columns
 * with their types, gaps and encoding, and the classes per split), and shows every
 * arm's rates at the first updates, at each epoch start and at the end, Σα and Σα² with each kind's
 * asymptotic class, and, for convex models, the mean stability bound 2/λmax(H) at the exact minimiser. Warns
 * when the replicates are too few for the verdict to detect any difference at the number of arms compared.
 * Exit 0 (warnings on stderr included), 2 for a bad plan or bad data (one line on stderr), 1 when the
 * convex model has no minimiser.
 */
@Command(name = "check", mixinStandardHelpOptions = true,
        description = "Validate a plan, print it resolved and every arm's rates.")
public final class CheckCommand implements Callable<Integer> {

    /** Arms per rate table, to keep lines short. */
    static final int ARMS_PER_TABLE = 6;
    /** Plans with more epochs show a sample of the epoch starts. */
    static final int ALL_EPOCHS_UP_TO = 100;
    /** α·λmax above which the linearised prediction is called rough (DESIGN.md, "Theory"). */
    static final double ROUGH_PREDICTION = 0.5;

    @Parameters(index = "0", paramLabel = "PLAN", description = "the plan YAML file")
    Path planFile;

    @Spec
    CommandSpec spec;

    @Override
    public Integer call() {
        PrintWriter out = spec.commandLine().getOut();
        PrintWriter err = spec.commandLine().getErr();
        ParsedPlan parsed = PlanParser.read(planFile);
        Plan plan = parsed.plan();
        List<String> warnings = new ArrayList<>(parsed.warnings());
        PlanData data = PlanData.load(parsed);
        warnings.addAll(data.warnings());
        // every check a run makes (the model, each arm's trainer, each arm's rates over the whole planned run, the
        // reference minimiser) before the plan is called valid: what check accepts, run accepts
        StudyContext context = StudyContext.build(parsed, data);
        RunShape shape = context.shape();
        List<double[]> rates = context.plannedRates();

        out.println("plan " + planFile + ": valid (sha256 " + PlanWriter.sha256(plan) + ")");
        out.println();
        out.println("resolved plan:");
        for (String line : PlanWriter.toYaml(plan).split("\n")) {
            out.println("  " + line);
        }
        out.println();
        Dataset all = data.all();
        out.printf(Locale.ROOT, "data: %s: %d rows, %d features, %d classes (%s)%n", plan.data().source(),
                all.rows(), all.features(), all.classes(), String.join(", ", all.classNames()));
        if (data.table() != null) {
            for (String line : TableLines.of(data.table())) {
                out.println(line);
            }
        }
        out.printf(Locale.ROOT, "splits: training %d, holdout %d, test %d rows%s%n", data.train().rows(),
                data.holdout() == null ? 0 : data.holdout().rows(), data.test().rows(),
                plan.data().standardize() ? "; standardised on the training split" : "");
        int batch = plan.training().batch();
        out.printf(Locale.ROOT, "updates: ⌈%d / %d⌉ = %d per epoch, %d epochs, %d updates in all (%s sampling)%n",
                data.train().rows(), batch, shape.updatesPerEpoch(), shape.epochs(), shape.totalUpdates(),
                plan.training().sampling().key());
        long tailLength = plan.training().tailLength(shape.totalUpdates());
        out.printf(Locale.ROOT, "tail: the last %d updates; %d snapshots%n", tailLength,
                Math.min(plan.training().snapshots(), tailLength));
        if (plan.training().snapshots() > tailLength) {
            warnings.add(parsed.error("training.snapshots", plan.training().snapshots() + " snapshots, but the tail"
                    + " has only " + tailLength + " updates; " + tailLength + " will be taken").getMessage());
        }
        if (batch > data.train().rows()) {
            warnings.add(parsed.error("training.batch", batch + " is more than the " + data.train().rows()
                    + " training rows; every update uses the whole training split").getMessage());
        }
        fewTestRows(data).ifPresent(detail -> warnings.add(parsed.error("data.test-fraction", detail).getMessage()));
        verdictReach(plan, VerdictOptions.defaults().significance()).ifPresent(
                detail -> warnings.add(parsed.error("replicates", detail).getMessage()));
        out.println();

        printArms(out, plan);
        out.println();
        printRates(out, plan, shape, rates);
        out.println();
        printSums(out, plan, shape, rates);
        out.println();
        for (int i = 0; i < plan.arms().size(); i++) {
            ArmPlan a = plan.arms().get(i);
            if (a.manual()) {
                warnings.add(parsed.error(parsed.armPath(i) + ".manual", "arm '" + a.name() + "' is manual: the"
                        + " rates shown are the planned ones, before any nudge").getMessage());
            }
            if (a.schedule().kind().equals("plateau")) {
                warnings.add(parsed.error(parsed.armPath(i) + ".schedule", "arm '" + a.name() + "' (plateau): the"
                        + " rates shown are its no-cut envelope; its cuts depend on the losses recorded while it"
                        + " trains").getMessage());
            }
        }
        int code = stability(out, parsed, context, rates, warnings);
        for (String w : warnings) {
            err.println("warning: " + w);
        }
        return code;
    }

    /**
     * @return the forecast that the report's per-class figures will rest on fewer than
     *     {@value ClassBalance#FEW_TEST_ROWS} test rows of the smallest class (or that a class has none), or empty
     */
    static Optional<String> fewTestRows(PlanData data) {
        if (data.test() == null) {
            return Optional.empty();
        }
        int[] counts = data.test().classCounts();
        int s = 0;
        for (int c = 1; c < counts.length; c++) {
            if (counts[c] < counts[s]) {
                s = c;
            }
        }
        if (counts[s] >= ClassBalance.FEW_TEST_ROWS) {
            return Optional.empty();
        }
        String name = data.test().classNames().get(s);
        return Optional.of(counts[s] == 0
                ? "class '" + Names.shown(name) + "' gets no test rows: the report cannot measure its recall; a"
                        + " larger data.test-fraction gives it some"
                : "the report's per-class figures will rest on " + ClassBalance.fewRows(name, counts[s])
                        + "; a larger data.test-fraction gives it more");
    }

    /**
     * Whether the verdict can reach a detected difference at all. It compares each of the m non-baseline arms with
     * the baseline by an exact signed-rank test on the n paired replicates, adjusted across the m arms
     * ({@link Multiplicity}: Bonferroni); the smallest adjusted p it can give is m · 2/2ⁿ (every pair on the same
     * side), so below {@link Multiplicity#pairsNeeded} replicates no arm can be declared different whatever the
     * data.
     *
     * @param significance the verdict's level
     * @return the warning's text when the plan's replicates are too few (the smallest p shown rounded up, so "at
     *     least" holds); empty with enough replicates, or with one arm (nothing to compare: {@link #printArms}
     *     says so)
     */
    static Optional<String> verdictReach(Plan plan, double significance) {
        int m = plan.arms().size() - 1;
        int n = plan.replicates();
        if (m < 1) {
            return Optional.empty();
        }
        int needed = Multiplicity.pairsNeeded(m, significance);
        if (n >= needed) {
            return Optional.empty();
        }
        String smallest = new BigDecimal(Multiplicity.smallestAdjustedP(m, n)).round(new MathContext(2, RoundingMode.UP))
                .stripTrailingZeros().toPlainString();
        return Optional.of(n + (n == 1 ? " replicate" : " replicates") + " with " + m + (m == 1 ? " arm" : " arms")
                + " against the baseline can reach " + (m == 1 ? "a p" : "an adjusted p") + " of at least " + smallest
                + ", never below " + BigDecimal.valueOf(significance).stripTrailingZeros().toPlainString() + "; "
                + needed + " are needed");
    }

    /** Grid-expanded arms have no position of their own; they report at their template's. */
    private static void printArms(PrintWriter out, Plan plan) {
        out.println("arms (baseline: " + plan.baseline() + "):");
        for (int i = 0; i < plan.arms().size(); i++) {
            ArmPlan a = plan.arms().get(i);
            out.printf(Locale.ROOT, "  #%-3d %s%s%s%n", i + 1, a.name(),
                    a.average() == ArmPlan.Averaging.TAIL ? " (tail-averaged)" : "", a.manual() ? " (manual)" : "");
            out.println("       " + a.schedule().schedule().describe());
        }
        if (plan.arms().size() == 1) {
            out.println("  no verdict: the plan has one arm, so there is no other arm to compare with the baseline");
        }
    }

    /** The updates shown: the first three, the first of every epoch (or a sample of them), and the last. */
    static TreeMap<Long, String> points(RunShape shape) {
        TreeMap<Long, String> points = new TreeMap<>();
        int epochs = shape.epochs();
        int step = epochs <= ALL_EPOCHS_UP_TO ? 1 : (int) Math.ceil(epochs / 50.0);
        for (int e = 1; e <= epochs; e++) {
            if (e <= 10 || (e - 1) % step == 0 || e == epochs) {
                points.put((long) (e - 1) * shape.updatesPerEpoch() + 1, "epoch start");
            }
        }
        for (long u = 1; u <= Math.min(3, shape.totalUpdates()); u++) {
            points.putIfAbsent(u, "first updates");
        }
        points.put(shape.totalUpdates(), "last update");
        return points;
    }

    private static void printRates(PrintWriter out, Plan plan, RunShape shape, List<double[]> rates) {
        out.println("rates α (counters: epoch 1 is the first pass over the training split; update 1 is the first"
                + " update; progress = (update − 1) / " + shape.totalUpdates() + "):");
        if (shape.epochs() > ALL_EPOCHS_UP_TO) {
            out.println("  (" + shape.epochs() + " epochs: the first 10 epoch starts, then every "
                    + (int) Math.ceil(shape.epochs() / 50.0) + "th, and the last)");
        }
        TreeMap<Long, String> points = points(shape);
        for (int from = 0; from < plan.arms().size(); from += ARMS_PER_TABLE) {
            int to = Math.min(plan.arms().size(), from + ARMS_PER_TABLE);
            StringBuilder head = new StringBuilder(String.format(Locale.ROOT, "  %6s %9s %8s  %-13s", "epoch",
                    "update", "progress", ""));
            for (int i = from; i < to; i++) {
                head.append(String.format(Locale.ROOT, " %11s", "#" + (i + 1)));
            }
            out.println(head.toString().stripTrailing());
            for (var p : points.entrySet()) {
                long u = p.getKey();
                StringBuilder row = new StringBuilder(String.format(Locale.ROOT, "  %6d %9d %8.4f  %-13s",
                        shape.epochOf(u), u, shape.progress(u), p.getValue()));
                for (int i = from; i < to; i++) {
                    row.append(String.format(Locale.ROOT, " %11s", rate(rates.get(i)[(int) (u - 1)])));
                }
                out.println(row);
            }
            if (to < plan.arms().size()) {
                out.println();
            }
        }
    }

    private static void printSums(PrintWriter out, Plan plan, RunShape shape, List<double[]> rates) {
        out.println("sums over the planned " + shape.totalUpdates() + " updates, and as the run grows without bound:");
        out.printf(Locale.ROOT, "  %-4s %12s %12s  %s%n", "arm", "Σα", "Σα²", "as the run grows");
        for (int i = 0; i < plan.arms().size(); i++) {
            RateSums s = RateSums.of(rates.get(i));
            Asymptotics a = plan.arms().get(i).schedule().schedule().asymptotics();
            out.printf(Locale.ROOT, "  %-4s %12s %12s  %s%n", "#" + (i + 1), rate(s.sum()),
                    rate(s.sumOfSquares()), a.description());
        }
    }

    private int stability(PrintWriter out, ParsedPlan parsed, StudyContext context, List<double[]> rates,
            List<String> warnings) {
        Plan plan = parsed.plan();
        Dataset train = context.data().train();
        Model model = context.model();
        Optional<String> skip = Curvature.skipReason(model);
        if (skip.isPresent()) {
            out.println("stability bound: not computed (" + skip.get() + ")");
            return Main.OK;
        }
        Minimum minimum = context.minimum();
        Curvature c = context.curvature() != null ? context.curvature() : Curvature.at(model, train, minimum.theta());
        double lambdaMax = c.lambdaMax();
        double beta = plan.training().momentum();
        double bound = c.stabilityBound(beta);
        out.printf(Locale.ROOT, "reference minimiser: F(θ*) = %s, ‖∇F‖∞ = %.2e (%s, %d iterations)%n",
                rate(minimum.objective()), minimum.gradientNorm(), minimum.method().name().toLowerCase(Locale.ROOT),
                minimum.iterations());
        out.printf(Locale.ROOT, "curvature at θ*: λmin(H) = %s, λmax(H) = %s%n", rate(c.lambdaMin()), rate(lambdaMax));
        out.printf(Locale.ROOT, "stability bound of the mean: α < %s = %s%n", Curvature.boundFormula(beta),
                rate(bound));
        out.printf(Locale.ROOT, "  %-4s %12s %10s%n", "arm", "max α", "max α·λmax");
        for (int i = 0; i < plan.arms().size(); i++) {
            double max = 0;
            for (double r : rates.get(i)) {
                max = Math.max(max, r);
            }
            double product = max * lambdaMax;
            String flag;
            ArmPlan a = plan.arms().get(i);
            if (max >= bound) {
                flag = "ABOVE the stability bound: the mean iterate oscillates or diverges along H's top direction";
                warnings.add(parsed.error(parsed.armPath(i) + ".schedule", "arm '" + a.name() + "': its largest"
                        + " rate " + rate(max) + " is above the stability bound " + rate(bound) + " = "
                        + Curvature.boundFormula(beta)).getMessage());
            } else if (product > ROUGH_PREDICTION) {
                flag = "α·λmax > " + ROUGH_PREDICTION + ": the noise-ball prediction is rough";
                warnings.add(parsed.error(parsed.armPath(i) + ".schedule", "arm '" + a.name() + "': α·λmax = "
                        + rate(product) + " > " + ROUGH_PREDICTION + ", so the first-order noise-ball prediction is"
                        + " rough for this arm").getMessage());
            } else {
                flag = "";
            }
            out.println(String.format(Locale.ROOT, "  %-4s %12s %10s  %s", "#" + (i + 1), rate(max), rate(product),
                    flag).stripTrailing());
        }
        out.println();
        printBound(out, plan, model, train, minimum, rates);
        return Main.OK;
    }

    /**
     * Each arm's value of the convex last-iterate bound (Defazio et al. 2023, Theorem 10; Schaipp et al., ICML
     * 2025, Theorem 1) for its planned rates, and the arms ranked by it: an a-priori ranking, labelled a bound.
     */
    private static void printBound(PrintWriter out, Plan plan, Model model, Dataset train, Minimum minimum,
            List<double[]> rates) {
        out.println("a-priori ranking by the convex last-iterate bound (a worst-case BOUND on E[F(θ_T)] − F(θ*), not a"
                + " prediction;");
        out.println("  Defazio et al. 2023, arXiv:2310.07831, Thm 10, as in Schaipp et al., ICML 2025, Thm 1):");
        AprioriBound bound = AprioriBound.of(plan, model, train, minimum.theta(), rates);
        if (!bound.computed()) {
            out.println("  " + bound.skipped());
            return;
        }
        out.printf(Locale.ROOT, "  D = ‖θ₀ − θ*‖ = %s (replicate 1's start), G = %s (root-mean-square norm of a"
                + " batch gradient at θ₀)%n", rate(bound.d()), rate(bound.g()));
        int n = plan.arms().size();
        double[] value = bound.values();
        Integer[] order = new Integer[n];
        for (int i = 0; i < n; i++) {
            order[i] = i;
        }
        java.util.Arrays.sort(order, (a, b) -> Double.compare(value[a], value[b]));
        out.printf(Locale.ROOT, "  %-4s %-4s %12s  %s%n", "rank", "arm", "bound", "name");
        for (int r = 0; r < n; r++) {
            int i = order[r];
            out.printf(Locale.ROOT, "  %-4d %-4s %12s  %s%n", r + 1, "#" + (i + 1), rate(value[i]),
                    plan.arms().get(i).name());
        }
    }

    /** @return a rate with 5 significant digits */
    static String rate(double v) {
        return String.format(Locale.ROOT, "%.5g", v);
    }
}
