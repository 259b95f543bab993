package settle.experiments.cli;

import java.io.IOException;
import java.io.PrintWriter;
import java.io.Writer;
import java.nio.charset.StandardCharsets;
import java.nio.file.Files;
import java.nio.file.Path;
import java.util.ArrayList;
import java.util.List;
import java.util.Locale;
import java.util.Map;
import java.util.concurrent.Callable;
import picocli.CommandLine.Command;
import picocli.CommandLine.Model.CommandSpec;
import picocli.CommandLine.Option;
import picocli.CommandLine.Spec;
import settle.datasets.DataSources;
import settle.datasets.Dataset;
import settle.datasets.PreparedData;
import settle.datasets.SplitRule;
import settle.datasets.table.TableOptions;
import settle.datasets.Standardiser;
import settle.engine.minimum.Minimiser;
import settle.engine.minimum.Minimum;
import settle.engine.minimum.NoMinimiserException;
import settle.engine.model.Activation;
import settle.engine.model.Model;
import settle.engine.model.ModelSpec;
import settle.engine.schedule.Schedule;
import settle.engine.schedule.Schedules;
import settle.engine.train.EpochRecord;
import settle.engine.train.ReferencePoint;
import settle.engine.train.ReplicateResult;
import settle.engine.train.ReplicateSeeds;
import settle.engine.train.Sampling;
import settle.engine.train.SampleOrders;
import settle.engine.train.Trainer;
import settle.engine.train.TrainingSettings;
import settle.engine.train.Wander;
import settle.engine.text.NearMiss;
import settle.experiments.plan.ParsedPlan;
import settle.experiments.plan.PlanData;
import settle.experiments.plan.Plan;
import settle.experiments.plan.PlanParser;
import settle.experiments.run.ReplicateKey;
import settle.input.BadInputException;
import settle.reports.format.AtomicFile;
import settle.experiments.study.ReplicateFile;
import settle.experiments.study.StudyContext;
import settle.reports.format.NumberText;
import settle.reports.format.ReplicateJson;
import settle.reports.format.StudyFormat;

/**
 * {@code settle trace}: trains one replicate (replicate 1 of the root seed) and prints it epoch by epoch; with
 * {@code --init} and {@code --order} it replays a run made elsewhere. Bad input prints one line to stderr and
 * exits 2; a diverged replicate exits 3; an I/O failure writing {@code --dump} exits 1.
 */
@Command(
        name = "trace",
        mixinStandardHelpOptions = true,
        description = {
            "Train one replicate and print it epoch by epoch (replicate 1 of --seed).",
            "The whole dataset trains unless --test-fraction is given; no standardisation unless --standardize.",
            "--init: parameters, one per line (binary logistic: the d weights, then the bias; multinomial: class 0's "
                    + "d weights, class 1's, ..., then the K biases; mlp: layer by layer, weights (out x in, "
                    + "row-major) then biases).",
            "--order: one line per epoch, the 0-based indices into the training rows of that epoch's order, "
                    + "comma-separated (N per line for shuffle, ceil(N/B)*B for replacement).",
            "--dump DIR writes updates.csv (epoch,update,rate), epochs.csv (epoch,objective,test_loss,"
                    + "test_accuracy,distance) and final.csv (the final parameters, one per line)."
        })
public final class TraceCommand implements Callable<Integer> {

    @Spec
    private CommandSpec spec;

    @Option(names = "--plan", paramLabel = "PLAN", description = "rerun one replicate of a plan's study (with --arm and --replicate)")
    private Path plan;

    @Option(names = "--arm", paramLabel = "NAME", description = "with --plan: the arm's name")
    private String arm;

    @Option(names = "--replicate", paramLabel = "K", description = "with --plan: the replicate, numbered from 1")
    private Integer replicate;

    @Option(names = "--data", paramLabel = "SOURCE",
            description = "csv:PATH, libsvm:PATH, bundled:NAME or synthetic:GENERATOR[?key=value&...]")
    private String data;

    @Option(names = "--label", paramLabel = "COL", description = "the label column (csv; default the last column)")
    private String label;

    @Option(names = "--model", paramLabel = "logistic|mlp", defaultValue = "logistic",
            description = "logistic (sigmoid for two classes, softmax for more) or mlp (default: ${DEFAULT-VALUE})")
    private String modelKind;

    @Option(names = "--hidden", paramLabel = "32,16", defaultValue = "32",
            description = "mlp hidden layer sizes, comma-separated (default: ${DEFAULT-VALUE})")
    private String hidden;

    @Option(names = "--activation", paramLabel = "relu|tanh", defaultValue = "relu",
            description = "mlp hidden activation (default: ${DEFAULT-VALUE})")
    private String activation;

    @Option(names = "--l2", paramLabel = "L", defaultValue = "1.0e-3",
            description = "λ, the penalty (λ/2)‖weights‖² on weights, not biases (default: ${DEFAULT-VALUE})")
    private double l2;

    @Option(names = "--schedule", paramLabel = "SCHEDULE",
            description = "the schedule as a YAML map, e.g. '{kind: reciprocal, rate: 0.2, decay: 1}'")
    private String schedule;

    @Option(names = "--epochs", paramLabel = "E", description = "passes over the training rows (≥ 1)")
    private Integer epochs;

    @Option(names = "--batch", paramLabel = "B", description = "rows per mini-batch (≥ 1)")
    private Integer batch;

    @Option(names = "--sampling", paramLabel = "shuffle|replacement", defaultValue = "shuffle",
            description = "shuffle (a fresh permutation per epoch) or replacement (default: ${DEFAULT-VALUE})")
    private String sampling;

    @Option(names = "--momentum", paramLabel = "M", defaultValue = "0",
            description = "heavy-ball β in [0, 1): v ← βv + g, θ ← θ − αv (default: ${DEFAULT-VALUE})")
    private double momentum;

    @Option(names = "--seed", paramLabel = "S", defaultValue = "1",
            description = "root seed: the start (unless --init), the order (unless --order) and the test split "
                    + "(default: ${DEFAULT-VALUE})")
    private long seed;

    @Option(names = "--test-fraction", paramLabel = "F",
            description = "hold out this stratified fraction (0 < F < 1) as the test split")
    private Double testFraction;

    @Option(names = "--standardize", description = "z-score the features, fitted on the training rows only")
    private boolean standardize;

    @Option(names = "--init", paramLabel = "FILE", description = "starting parameters, one per line")
    private Path init;

    @Option(names = "--order", paramLabel = "FILE", description = "the sample order, one line per epoch")
    private Path order;

    @Option(names = "--dump", paramLabel = "DIR", description = "write updates.csv, epochs.csv and final.csv here")
    private Path dump;

    @Override
    public Integer call() throws IOException {
        PrintWriter out = spec.commandLine().getOut();
        PrintWriter err = spec.commandLine().getErr();
        if (dump != null && Files.exists(dump) && !Files.isDirectory(dump)) {
            throw BadInputException.of("--dump", "--dump " + dump + " is a file; expected a directory to write the"
                    + " dump into (it is made if missing)");
        }
        if (plan != null) {
            return tracePlan(out, err);
        }
        if (arm != null || replicate != null) {
            throw BadInputException.of("--arm", "--arm and --replicate go with --plan");
        }
        List<String> missing = new ArrayList<>();
        if (data == null) {
            missing.add("--data=SOURCE");
        }
        if (schedule == null) {
            missing.add("--schedule=SCHEDULE");
        }
        if (epochs == null) {
            missing.add("--epochs=E");
        }
        if (batch == null) {
            missing.add("--batch=B");
        }
        if (!missing.isEmpty()) {
            throw BadInputException.of("", "missing " + String.join(", ", missing)
                    + " (or give --plan PLAN --arm NAME --replicate K to rerun one replicate of a study)");
        }
        Prepared prepared = prepare(err);
        Trainer trainer = prepared.trainer;
        out.println(prepared.model.describe() + "; " + prepared.train.rows() + " training rows"
                + (prepared.test == null ? "" : ", " + prepared.test.rows() + " test rows") + "; "
                + trainer.shape().epochs() + " epochs × " + trainer.shape().updatesPerEpoch() + " updates of batch "
                + batch + " (" + sampling + ")" + (momentum == 0 ? "" : ", momentum " + number(momentum)));
        out.println("schedule " + prepared.schedule.describe());
        ReplicateSeeds seeds = ReplicateSeeds.derive(seed, 1);
        out.println("seed " + seed + ", replicate 1: " + seeds.algorithm() + " initialisation seed "
                + seeds.initialisationSeed() + ", sampling seed " + seeds.samplingSeed()
                + (init != null ? "; start from " + init : "") + (order != null ? "; order from " + order : ""));
        if (prepared.referenceNote != null) {
            out.println(prepared.referenceNote);
        }
        ReplicateResult result = printRun(out, trainer, seeds);
        if (dump != null) {
            try {
                writeDump(dump, result, trainer.shape().updatesPerEpoch());
            } catch (IOException e) {
                throw new IOException("cannot write " + dump + ": " + e.getMessage(), e);
            }
            out.println("wrote " + dump.resolve("updates.csv") + ", " + dump.resolve("epochs.csv") + ", "
                    + dump.resolve("final.csv"));
            out.flush();
        }
        return result.diverged() ? Main.INCOMPLETE : Main.OK;
    }

    /**
     * The {@code --plan} form: reruns replicate K of one arm exactly as {@code settle run} trains it (same data,
     * split, model, reference and seeds), prints it epoch by epoch, and with {@code --dump} also writes the
     * replicate file, byte for byte the one in the study directory.
     */
    private int tracePlan(PrintWriter out, PrintWriter err) throws IOException {
        List<String> stray = new ArrayList<>();
        for (String option : List.of("--data", "--label", "--model", "--hidden", "--activation", "--l2", "--schedule",
                "--epochs", "--batch", "--sampling", "--momentum", "--seed", "--test-fraction", "--standardize",
                "--init", "--order")) {
            if (spec.commandLine().getParseResult().hasMatchedOption(option)) {
                stray.add(option);
            }
        }
        if (!stray.isEmpty()) {
            throw BadInputException.of("", String.join(", ", stray) + (stray.size() == 1 ? " does" : " do")
                    + " not go with --plan: the plan fixes the data, model and training");
        }
        if (arm == null || replicate == null) {
            throw BadInputException.of("--plan", "--plan needs --arm NAME and --replicate K");
        }
        StudyContext context;
        ReplicateKey key;
        {
            ParsedPlan parsed = PlanParser.read(plan);
            Plan p = parsed.plan();
            int index = -1;
            List<String> names = new ArrayList<>();
            for (int i = 0; i < p.arms().size(); i++) {
                names.add(p.arms().get(i).name());
                if (p.arms().get(i).name().equals(arm)) {
                    index = i + 1;
                }
            }
            if (index < 0) {
                throw BadInputException.of("--arm", "--arm: no arm named " + BadInputException.shown(arm) + " in " + plan
                        + NearMiss.suggestion(arm, names) + " (the arms: " + String.join(", ", names) + ")");
            }
            if (replicate < 1 || replicate > p.replicates()) {
                throw BadInputException.of("--replicate", "--replicate = " + replicate + " is not accepted; the plan has"
                        + " replicates 1.." + p.replicates());
            }
            key = new ReplicateKey(index, replicate);
            context = StudyContext.build(parsed);
        }
        Trainer trainer = context.trainer(key.arm());
        ReplicateSeeds seeds = context.seeds(key.replicate());
        out.println(plan + ": arm " + key.arm() + " '" + arm + "', replicate " + key.replicate() + " of "
                + context.plan().replicates() + "; " + context.model().describe() + "; " + context.data().train().rows()
                + " training rows, " + context.data().test().rows() + " test rows; " + trainer.shape().epochs()
                + " epochs × " + trainer.shape().updatesPerEpoch() + " updates");
        out.println("schedule " + context.plan().arms().get(key.arm() - 1).schedule().schedule().describe());
        out.println("seed " + seeds.rootSeed() + ", replicate " + seeds.replicate() + ": " + seeds.algorithm()
                + " initialisation seed " + seeds.initialisationSeed() + ", sampling seed " + seeds.samplingSeed());
        ReplicateResult result = printRun(out, trainer, seeds);
        if (dump != null) {
            try {
                writeDump(dump, result, trainer.shape().updatesPerEpoch());
                ReplicateJson.writeFiles(dump.resolve("replicate.json"), ReplicateJson.write(ReplicateFile.of(context,
                        key, result)));
            } catch (IOException e) {
                throw new IOException("cannot write " + dump + ": " + e.getMessage(), e);
            }
            out.println("wrote " + dump.resolve("updates.csv") + ", " + dump.resolve("epochs.csv") + ", "
                    + dump.resolve("final.csv") + ", " + dump.resolve("replicate.json") + " and replicate.bin (the study's "
                    + StudyFormat.replicatePath(key.arm(), key.replicate()) + " and its binary file)");
            out.flush();
        }
        return result.diverged() ? Main.INCOMPLETE : Main.OK;
    }

    /** Trains one replicate, printing each epoch as it ends and the wander at the end. */
    private static ReplicateResult printRun(PrintWriter out, Trainer trainer, ReplicateSeeds seeds) {
        String row = "%5s  %11s  %14s  %14s  %9s  %12s%n";
        out.printf(Locale.ROOT, row, "epoch", "rate", "objective", "test loss", "test acc", "distance");
        out.flush();
        ReplicateResult result = trainer.run(seeds, e -> {
            out.printf(Locale.ROOT, row, e.epoch(), fmt(e.rate()), fmt(e.objective()), fmt(e.testLoss()),
                    fmt(e.testAccuracy()), fmt(e.distance()));
            out.flush();
        });
        if (result.diverged()) {
            out.println("diverged at update " + result.divergedAt() + " of " + result.totalUpdates()
                    + " (a loss was not finite or above 1e6 × F(θ₀) = " + fmt(1e6 * result.initialObjective()) + ")");
        } else {
            Wander w = result.wander();
            out.println("tail: last " + w.tail().length() + " updates, " + w.tail().snapshots() + " snapshots; "
                    + "tail radius " + fmt(w.tailRadius()) + ", tail loss spread " + fmt(w.tailLossSpread())
                    + (Double.isNaN(w.tailDistance()) ? "" : ", tail distance " + fmt(w.tailDistance())));
            if (!Double.isNaN(w.finalGap())) {
                out.println("final gap " + fmt(w.finalGap()) + ", final distance " + fmt(w.finalDistance())
                        + ", averaged gap " + fmt(w.averagedGap()));
            }
        }
        out.flush();
        return result;
    }

    /** Everything the run needs, validated. */
    private record Prepared(Model model, Dataset train, Dataset test, Schedule schedule, Trainer trainer,
            String referenceNote) {
    }

    private Prepared prepare(PrintWriter err) {
        if (epochs < 1) {
            throw BadInputException.of("--epochs", "--epochs = " + epochs + " is not accepted; expected an integer ≥ 1");
        }
        if (batch < 1) {
            throw BadInputException.of("--batch", "--batch = " + batch + " is not accepted; expected an integer ≥ 1");
        }
        if (!(momentum >= 0 && momentum < 1)) {
            throw BadInputException.of("--momentum", "--momentum = " + momentum + " is not accepted; expected a number in [0, 1)");
        }
        if (testFraction != null && !(testFraction > 0 && testFraction < 1)) {
            throw BadInputException.of("--test-fraction", "--test-fraction = " + testFraction
                    + " is not accepted; expected a number strictly between 0 and 1");
        }
        Sampling mode;
        try {
            mode = Sampling.parse(sampling);
        } catch (BadInputException e) {
            throw BadInputException.of("--sampling", "--sampling must be shuffle or replacement: '" + sampling + "'");
        }
        ModelSpec modelSpec = modelSpec();
        Map<String, Object> map;
        try {
            map = RatesCommand.readMap(schedule);
        } catch (BadInputException e) {
            throw BadInputException.of("--schedule", "--" + e.getMessage());
        }
        Schedule parsed;
        try {
            parsed = Schedules.parse(map);
        } catch (BadInputException e) {
            throw BadInputException.of("--schedule", "--schedule: " + e.getMessage());
        }

        // a CSV table takes the default table keys here (text columns one-hot, gaps refused); levels are fitted on
        // the training rows alone, as in a study
        PreparedData prepared = DataSources.prepare(data, label, TableOptions.DEFAULTS, null, testFraction == null
                ? SplitRule.NONE : new SplitRule(testFraction, PlanData.testSplitSeed(seed), 0, 0));
        for (String warning : prepared.warnings()) {
            err.println("settle trace: warning: " + warning);
        }
        Dataset all = prepared.all();
        Dataset train = all;
        Dataset test = null;
        if (testFraction != null) {
            train = all.subset(all.name() + " (training part)", prepared.train());
            test = all.subset(all.name() + " (held-out part)", prepared.test());
        }
        if (standardize) {
            Standardiser standardiser = Standardiser.fit(train);
            for (String warning : standardiser.warnings()) {
                err.println("settle trace: warning: " + warning);
            }
            train = standardiser.apply(train);
            test = test == null ? null : standardiser.apply(test);
        }
        Model model = modelSpec.build(train.features(), train.classes());
        TrainingSettings settings = TrainingSettings.of(epochs, batch).withSampling(mode).withMomentum(momentum);

        ReferencePoint reference = null;
        String note = null;
        if (modelSpec.convex()) {
            try {
                Minimum minimum = new Minimiser().minimise(model, train);
                reference = new ReferencePoint(minimum.theta(), minimum.objective());
                note = "reference minimiser: F(θ*) = " + fmt(minimum.objective()) + ", ‖∇F‖∞ = "
                        + fmt(minimum.gradientNorm()) + (minimum.converged() ? "" : " (not converged: best point found)");
            } catch (NoMinimiserException e) {
                note = "no reference minimiser (" + e.getMessage() + "): no distances or gaps";
            }
        }

        Trainer.Builder builder = Trainer.builder(model, train, parsed, settings).test(test).reference(reference)
                .initialisation(modelSpec.init());
        if (init != null) {
            builder.start(readInit(init, model));
        }
        if (order != null) {
            builder.orders(readOrder(order, settings, train.rows()));
        }
        return new Prepared(model, train, test, parsed, builder.build(), note);
    }

    private ModelSpec modelSpec() {
        ModelSpec.Kind kind;
        try {
            kind = ModelSpec.Kind.parse(modelKind);
        } catch (BadInputException e) {
            throw BadInputException.of("--model", "--model must be logistic or mlp: '" + modelKind + "'");
        }
        if (!(l2 >= 0) || Double.isInfinite(l2)) {
            throw BadInputException.of("--l2", "--l2 = " + l2 + " is not accepted; expected a finite number ≥ 0");
        }
        if (kind == ModelSpec.Kind.LOGISTIC) {
            return ModelSpec.logistic(l2);
        }
        List<Integer> sizes = new ArrayList<>();
        for (String part : hidden.split(",", -1)) {
            try {
                int size = Integer.parseInt(part.strip());
                if (size < 1) {
                    throw new NumberFormatException();
                }
                sizes.add(size);
            } catch (NumberFormatException e) {
                throw BadInputException.of("--hidden", "--hidden '" + hidden
                        + "' is not accepted; expected comma-separated layer sizes ≥ 1, e.g. 32,16");
            }
        }
        Activation act;
        try {
            act = Activation.parse(activation);
        } catch (BadInputException e) {
            throw BadInputException.of("--activation", "--activation must be relu or tanh: '" + activation + "'");
        }
        return ModelSpec.mlp(sizes, act, l2);
    }

    /** Reads one parameter per line (blank lines at the end ignored). */
    static double[] readInit(Path file, Model model) {
        List<String> lines = lines(file, "--init");
        int p = model.parameterCount();
        if (lines.size() != p) {
            throw BadInputException.inFile(file.toString(), "", "" + lines.size() + " values, the model has " + p
                    + " parameters (" + model.describe() + "; one value per line)");
        }
        double[] theta = new double[p];
        for (int i = 0; i < p; i++) {
            String cell = lines.get(i).strip();
            try {
                theta[i] = Double.parseDouble(cell);
            } catch (NumberFormatException e) {
                throw BadInputException.at(file.toString(), i + 1, 0, "", "'" + cell + "' is not a number");
            }
            if (!Double.isFinite(theta[i])) {
                throw BadInputException.at(file.toString(), i + 1, 0, "", "'" + cell + "' is not finite");
            }
        }
        return theta;
    }

    /** Reads one line per epoch of comma-separated 0-based row indices (blank lines at the end ignored). */
    static int[][] readOrder(Path file, TrainingSettings settings, int rows) {
        List<String> lines = lines(file, "--order");
        if (lines.size() != settings.epochs()) {
            throw BadInputException.inFile(file.toString(), "", "" + lines.size() + " lines, expected one per epoch ("
                    + settings.epochs() + ")");
        }
        int length = SampleOrders.length(settings.sampling(), rows, settings.batch());
        int[][] orders = new int[lines.size()][];
        for (int e = 0; e < orders.length; e++) {
            String[] cells = lines.get(e).split(",", -1);
            if (cells.length != length) {
                throw BadInputException.at(file.toString(), e + 1, 0, "", "" + cells.length + " indices, expected "
                        + length + (settings.sampling() == Sampling.SHUFFLE ? " (one per training row)"
                                : " (⌈N/B⌉·B = " + length + " for replacement sampling)"));
            }
            orders[e] = new int[length];
            for (int i = 0; i < length; i++) {
                String cell = cells[i].strip();
                int index;
                try {
                    index = Integer.parseInt(cell);
                } catch (NumberFormatException ex) {
                    throw BadInputException.at(file.toString(), e + 1, i + 1, "", "item " + (i + 1) + ": '" + cell
                            + "' is not a row index; expected an integer in 0.." + (rows - 1));
                }
                if (index < 0 || index >= rows) {
                    throw BadInputException.at(file.toString(), e + 1, i + 1, "", "item " + (i + 1) + ": index "
                            + index + " is outside the training rows 0.." + (rows - 1));
                }
                orders[e][i] = index;
            }
        }
        return orders;
    }

    private static List<String> lines(Path file, String option) {
        List<String> lines;
        try {
            lines = new ArrayList<>(Files.readAllLines(file, StandardCharsets.UTF_8));
        } catch (IOException e) {
            throw BadInputException.of(option, option + ": cannot read " + file + " (" + e.getClass().getSimpleName()
                    + (e.getMessage() == null ? "" : ": " + e.getMessage()) + ")");
        }
        while (!lines.isEmpty() && lines.get(lines.size() - 1).isBlank()) {
            lines.remove(lines.size() - 1);
        }
        for (int i = 0; i < lines.size(); i++) {
            if (lines.get(i).isBlank()) {
                throw BadInputException.at(file.toString(), i + 1, 0, "", "empty line");
            }
        }
        return lines;
    }

    /**
     * Writes updates.csv (every update applied), epochs.csv (every completed epoch) and final.csv (θ_T) into
     * {@code dir}, creating it. Numbers are written as the shortest decimal that reads back as the same double.
     */
    static void writeDump(Path dir, ReplicateResult result, int updatesPerEpoch) throws IOException {
        Files.createDirectories(dir);
        try (Writer w = Files.newBufferedWriter(dir.resolve("updates.csv"), StandardCharsets.UTF_8)) {
            w.write("epoch,update,rate\n");
            double[] rates = result.rates();
            for (int t = 1; t <= rates.length; t++) {
                int epoch = (t - 1) / updatesPerEpoch + 1;
                w.write(epoch + "," + t + "," + NumberText.shortest(rates[t - 1]) + "\n");
            }
        }
        try (Writer w = Files.newBufferedWriter(dir.resolve("epochs.csv"), StandardCharsets.UTF_8)) {
            w.write("epoch,objective,test_loss,test_accuracy,distance\n");
            for (EpochRecord e : result.epochs()) {
                w.write(e.epoch() + "," + cell(e.objective()) + "," + cell(e.testLoss()) + "," + cell(e.testAccuracy())
                        + "," + cell(e.distance()) + "\n");
            }
        }
        try (Writer w = Files.newBufferedWriter(dir.resolve("final.csv"), StandardCharsets.UTF_8)) {
            for (double v : result.finalParameters()) {
                w.write(NumberText.shortest(v) + "\n");
            }
        }
    }

    /** @return the shortest decimal that reads back as the same double; empty for NaN (not applicable) */
    private static String cell(double v) {
        return Double.isNaN(v) ? "" : NumberText.shortest(v);
    }

    private static String fmt(double v) {
        return Double.isNaN(v) ? "-" : String.format(Locale.ROOT, "%.8g", v);
    }

    private static String number(double v) {
        return v == Math.rint(v) && Math.abs(v) < 1e15 ? Long.toString((long) v) : Double.toString(v);
    }
}
