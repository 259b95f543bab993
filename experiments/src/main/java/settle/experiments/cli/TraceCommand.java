package settle.experiments.cli;

import java.io.IOException;
import java.io.OutputStreamWriter;
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
import picocli.CommandLine.ArgGroup;
import picocli.CommandLine.Command;
import picocli.CommandLine.Model.CommandSpec;
import picocli.CommandLine.Option;
import picocli.CommandLine.Spec;
import settle.engine.model.Activation;
import settle.engine.model.Model;
import settle.engine.model.ModelSpec;
import settle.engine.schedule.Schedule;
import settle.engine.schedule.Schedules;
import settle.engine.text.NearMiss;
import settle.engine.train.EpochRecord;
import settle.engine.train.ReplicateResult;
import settle.engine.train.ReplicateSeeds;
import settle.engine.train.SampleOrders;
import settle.engine.train.Sampling;
import settle.engine.train.Trainer;
import settle.engine.train.TrainingSettings;
import settle.engine.train.Wander;
import settle.experiments.plan.ArmPlan;
import settle.experiments.plan.DataPlan;
import settle.experiments.plan.Defaults;
import settle.experiments.plan.ParsedPlan;
import settle.experiments.plan.Plan;
import settle.experiments.plan.PlanParser;
import settle.experiments.plan.ScheduleSpec;
import settle.experiments.run.ReplicateKey;
import settle.experiments.study.ReplicateFile;
import settle.experiments.study.StudyContext;
import settle.input.BadInputException;
import settle.reports.format.AtomicFile;
import settle.reports.format.Csv;
import settle.reports.format.NumberText;
import settle.reports.format.ReplicateJson;
import settle.reports.format.StudyFormat;

/**
 * {@code settle trace}: trains one replicate through the study pipeline ({@link StudyContext}: load, split,
 * standardise, model, minimiser) and prints it epoch by epoch. {@code --plan} reruns replicate K of one arm of a
 * plan; {@code --data} builds a one-arm plan in memory from the options, with the plan's defaults
 * ({@link settle.experiments.plan.Defaults}), and is replicate 1 of {@code --seed}; with {@code --init} and
 * {@code --order} it replays a run made elsewhere. Bad input prints one line to stderr and exits 2; a diverged
 * replicate exits 3; an I/O failure writing {@code --dump} exits 1.
 */
@Command(
        name = "trace",
        mixinStandardHelpOptions = true,
        defaultValueProvider = OptionDefaults.class,
        description = {
            "Train one replicate through the study pipeline and print it epoch by epoch.",
            "--data trains replicate 1 of --seed with the plan's defaults (a stratified test split of --test-fraction,"
                    + " standardised features; --test-fraction 0 --no-standardize trains on every row as read).",
            "--init: parameters, one per line (binary logistic: the d weights, then the bias; multinomial: class 0's "
                    + "d weights, class 1's, ..., then the K biases; mlp: layer by layer, weights (out x in, "
                    + "row-major) then biases).",
            "--order: one line per epoch, the 0-based indices into the training rows of that epoch's order, "
                    + "comma-separated (N per line for shuffle, ceil(N/B)*B for replacement).",
            "--dump DIR writes updates.csv (epoch,update,rate), " + TraceCommand.EPOCHS_FILE + " (epoch,objective,"
                    + "test_loss,test_accuracy,distance) and final.csv (the final parameters, one per line); with"
                    + " --plan also replicate.json, the study's replicate file."
        })
public final class TraceCommand implements Callable<Integer> {

    /** The per-epoch file of {@code --dump}; not the study's {@code epochs.csv}, whose columns differ. */
    static final String EPOCHS_FILE = "trace-epochs.csv";

    @Spec
    private CommandSpec spec;

    @ArgGroup(exclusive = true, multiplicity = "1")
    private Form form;

    @Option(names = "--dump", paramLabel = "DIR",
            description = "write updates.csv, " + EPOCHS_FILE + " and final.csv here (made if missing)")
    private Path dump;

    /** Either form, never both (picocli refuses a mix with one line). */
    static final class Form {
        @ArgGroup(exclusive = false, multiplicity = "1", heading = "Rerun one replicate of a plan's study:%n")
        PlanForm plan;

        @ArgGroup(exclusive = false, multiplicity = "1", heading = "Or train one replicate from data:%n")
        DataForm data;
    }

    /** {@code --plan PLAN --arm NAME --replicate K}. */
    static final class PlanForm {
        @Option(names = "--plan", required = true, paramLabel = "PLAN", description = "the plan of the study")
        Path plan;

        @Option(names = "--arm", required = true, paramLabel = "NAME", description = "the arm's name")
        String arm;

        @Option(names = "--replicate", required = true, paramLabel = "K", description = "the replicate, numbered from 1")
        int replicate;
    }

    /** {@code --data SOURCE --schedule SCHEDULE} and the plan keys they may set. */
    static final class DataForm extends DataOptions {

        @Option(names = "--schedule", required = true, paramLabel = "SCHEDULE",
                description = "the schedule as a YAML map, e.g. '{kind: reciprocal, rate: 0.2, decay: 1}'")
        String schedule;

        @Option(names = "--model", paramLabel = "logistic|mlp",
                description = "logistic (sigmoid for two classes, softmax for more) or mlp (default: ${DEFAULT-VALUE})")
        ModelSpec.Kind model;

        @Option(names = "--hidden", split = ",", paramLabel = "32,16",
                description = "mlp hidden layer sizes, comma-separated (default: ${DEFAULT-VALUE})")
        List<Integer> hidden;

        @Option(names = "--activation", paramLabel = "relu|tanh", description = "mlp hidden activation (default: ${DEFAULT-VALUE})")
        Activation activation;

        @Option(names = "--epochs", paramLabel = "E", description = "passes over the training rows (default: ${DEFAULT-VALUE})")
        int epochs;

        @Option(names = "--batch", paramLabel = "B", description = "rows per mini-batch (default: ${DEFAULT-VALUE})")
        int batch;

        @Option(names = "--sampling", paramLabel = "shuffle|replacement",
                description = "shuffle (a fresh permutation per epoch) or replacement (default: ${DEFAULT-VALUE})")
        Sampling sampling;

        @Option(names = "--momentum", paramLabel = "M",
                description = "heavy-ball β in [0, 1): v ← βv + g, θ ← θ − αv (default: ${DEFAULT-VALUE})")
        double momentum;

        @Option(names = "--seed", paramLabel = "S",
                description = "root seed: the start (unless --init), the order (unless --order) and the test split "
                        + "(default: ${DEFAULT-VALUE})")
        long seed;

        @Option(names = "--test-fraction", paramLabel = "F",
                description = "the stratified fraction held out as the test split, in [0, 1); 0: every row trains "
                        + "(default: ${DEFAULT-VALUE})")
        double testFraction;

        @Option(names = "--init", paramLabel = "FILE", description = "starting parameters, one per line")
        Path init;

        @Option(names = "--order", paramLabel = "FILE", description = "the sample order, one line per epoch")
        Path order;
    }

    /** Which option sets each key of the plan {@code --data} builds, for a problem found while building the study. */
    private static final Map<String, String> OPTION_OF_KEY = Map.of(
            "data", "--data", "data.label", "--label", "data.test-fraction", "--test-fraction",
            "model", "--model", "model.l2", "--l2", "arms[0]", "--schedule", "training.batch", "--batch",
            "training.epochs", "--epochs");

    @Override
    public Integer call() throws IOException {
        PrintWriter out = spec.commandLine().getOut();
        PrintWriter err = spec.commandLine().getErr();
        if (dump != null && Files.exists(dump) && !Files.isDirectory(dump)) {
            throw BadInputException.of("--dump", "--dump " + dump + " is a file; expected a directory to write the"
                    + " dump into (it is made if missing)");
        }
        ReplicateKey key;
        StudyContext context;
        Trainer trainer;
        String origin;
        if (form.plan != null) {
            PlanForm f = form.plan;
            ParsedPlan parsed = PlanParser.read(f.plan);
            key = key(parsed.plan(), f);
            context = StudyContext.build(parsed);
            trainer = context.trainer(key.arm());
            origin = f.plan + ": arm " + key.arm() + " '" + f.arm + "', replicate " + key.replicate() + " of "
                    + context.plan().replicates() + "; ";
        } else {
            DataForm f = form.data;
            ParsedPlan parsed = ParsedPlan.fromOptions(plan(f), OPTION_OF_KEY);
            key = new ReplicateKey(1, 1);
            context = StudyContext.build(parsed);
            trainer = f.init == null && f.order == null ? context.trainer(1)
                    : context.replayTrainer(1, f.init == null ? null : readInit(f.init, context.model()),
                            f.order == null ? null : readOrder(f.order, context.plan().training(),
                                    context.data().train().rows()));
            origin = "";
        }
        for (String warning : context.data().warnings()) {
            err.println("settle trace: warning: " + warning);
        }
        err.flush();
        Plan plan = context.plan();
        ReplicateSeeds seeds = context.seeds(key.replicate());
        out.println(origin + context.model().describe() + "; " + context.data().train().rows() + " training rows"
                + (context.data().test() == null ? "" : ", " + context.data().test().rows() + " test rows")
                + (plan.data().standardize() ? " (standardised)" : "") + "; " + trainer.shape().epochs()
                + " epochs × " + trainer.shape().updatesPerEpoch() + " updates of batch " + plan.training().batch()
                + " (" + plan.training().sampling() + ")"
                + (plan.training().momentum() == 0 ? "" : ", momentum " + number(plan.training().momentum())));
        out.println("schedule " + plan.arms().get(key.arm() - 1).schedule().schedule().describe());
        DataForm f = form.data;
        out.println("seed " + seeds.rootSeed() + ", replicate " + seeds.replicate() + ": " + seeds.algorithm()
                + " initialisation seed " + seeds.initialisationSeed() + ", sampling seed " + seeds.samplingSeed()
                + (f != null && f.init != null ? "; start from " + f.init : "")
                + (f != null && f.order != null ? "; order from " + f.order : ""));
        if (context.minimum() != null) {
            out.println("reference minimiser: F(θ*) = " + fmt(context.minimum().objective()) + ", ‖∇F‖∞ = "
                    + fmt(context.minimum().gradientNorm())
                    + (context.minimum().converged() ? "" : " (not converged: best point found)"));
        }
        ReplicateResult result = printRun(out, trainer, seeds);
        if (dump != null) {
            String also = "";
            try {
                writeDump(dump, result, trainer.shape().updatesPerEpoch());
                if (form.plan != null) {
                    ReplicateJson.writeFiles(dump.resolve("replicate.json"), ReplicateJson.write(ReplicateFile.of(
                            context, key, result)));
                    also = " and " + dump.resolve("replicate.json") + " with replicate.bin (the study's "
                            + StudyFormat.replicatePath(context.armId(key.arm()), key.replicate()) + " and its binary file)";
                }
            } catch (IOException e) {
                throw new IOException("cannot write " + dump + ": " + e.getMessage(), e);
            }
            out.println("wrote " + dump.resolve("updates.csv") + ", " + dump.resolve(EPOCHS_FILE) + ", "
                    + dump.resolve("final.csv") + also);
            out.flush();
        }
        return result.diverged() ? Main.INCOMPLETE : Main.OK;
    }

    /**
     * A usage error of trace said in the command's terms: options of the data form given with {@code --plan} are
     * named as such (picocli would report the data form's missing options instead).
     *
     * @param message picocli's message
     * @param args the command line's arguments
     * @return the line to print after {@code settle trace: }
     */
    static String explain(String message, List<String> args) {
        boolean withPlan = args.stream().anyMatch(a -> a.equals("--plan") || a.startsWith("--plan="));
        if (!withPlan) {
            boolean planOptions = args.stream().anyMatch(a -> a.equals("--arm") || a.startsWith("--arm=")
                    || a.equals("--replicate") || a.startsWith("--replicate="));
            return planOptions ? "--arm and --replicate go with --plan PLAN (to rerun one replicate of a study)"
                    : message;
        }
        List<String> stray = new ArrayList<>();
        for (String option : DATA_FORM_OPTIONS) {
            if (args.stream().anyMatch(a -> a.equals(option) || a.startsWith(option + "="))) {
                stray.add(option);
            }
        }
        return stray.isEmpty() ? message : String.join(", ", stray) + (stray.size() == 1 ? " does" : " do")
                + " not go with --plan: the plan fixes the data, model and training";
    }

    /** The options of the data form, in the order of --help. */
    private static final List<String> DATA_FORM_OPTIONS = List.of("--data", "--label", "--l2", "--standardize",
            "--no-standardize", "--schedule", "--model", "--hidden", "--activation", "--epochs", "--batch",
            "--sampling", "--momentum", "--seed", "--test-fraction", "--init", "--order");

    /** @return the key of {@code --arm} and {@code --replicate} in the plan */
    private static ReplicateKey key(Plan p, PlanForm f) {
        int index = -1;
        List<String> names = new ArrayList<>();
        for (int i = 0; i < p.arms().size(); i++) {
            names.add(p.arms().get(i).name());
            if (p.arms().get(i).name().equals(f.arm)) {
                index = i + 1;
            }
        }
        if (index < 0) {
            throw BadInputException.of("--arm", "--arm: no arm named " + BadInputException.shown(f.arm) + " in "
                    + f.plan + NearMiss.suggestion(f.arm, names) + " (the arms: " + String.join(", ", names) + ")");
        }
        if (f.replicate < 1 || f.replicate > p.replicates()) {
            throw BadInputException.of("--replicate", "--replicate = " + f.replicate + " is not accepted; the plan has"
                    + " replicates 1.." + p.replicates());
        }
        return new ReplicateKey(index, f.replicate);
    }

    /** @return the one-arm plan of the {@code --data} form, its values checked where picocli's types leave them open */
    private static Plan plan(DataForm f) {
        f.check();
        if (f.epochs < 1 || f.epochs > TrainingSettings.MAX_EPOCHS) {
            throw BadInputException.of("--epochs", "--epochs = " + f.epochs + " is not accepted; expected an integer in"
                    + " 1.." + TrainingSettings.MAX_EPOCHS);
        }
        if (f.batch < 1) {
            throw BadInputException.of("--batch", "--batch = " + f.batch + " is not accepted; expected an integer ≥ 1");
        }
        if (!(f.momentum >= 0 && f.momentum < 1)) {
            throw BadInputException.of("--momentum", "--momentum = " + f.momentum
                    + " is not accepted; expected a number in [0, 1)");
        }
        if (!(f.testFraction >= 0 && f.testFraction < 1)) {
            throw BadInputException.of("--test-fraction", "--test-fraction = " + f.testFraction
                    + " is not accepted; expected a number in [0, 1) (0: every row trains)");
        }
        ModelSpec model = f.model == ModelSpec.Kind.LOGISTIC ? ModelSpec.logistic(f.l2)
                : ModelSpec.mlp(hidden(f.hidden), f.activation, f.l2);
        Map<String, Object> map;
        try {
            map = RatesCommand.readMap(f.schedule);
        } catch (BadInputException e) {
            throw BadInputException.of("--schedule", "--" + e.getMessage());
        }
        Schedule schedule;
        try {
            schedule = Schedules.parse(map);
        } catch (BadInputException e) {
            throw BadInputException.of("--schedule", "--schedule: " + e.getMessage());
        }
        ArmPlan arm = new ArmPlan("trace", new ScheduleSpec(map, schedule), ArmPlan.Averaging.NONE, false);
        return new Plan("trace", f.seed, 1, new DataPlan(f.source, f.label, f.testFraction,
                Defaults.HOLDOUT_FRACTION, f.standardize), model, new TrainingSettings(f.epochs, f.batch, f.sampling,
                f.momentum, Defaults.TAIL, Defaults.SNAPSHOTS, false), arm.name(), List.of(arm));
    }

    /** @return the layer widths of {@code --hidden} (picocli has read the integers), each checked 1..MAX_WIDTH */
    private static List<Integer> hidden(List<Integer> widths) {
        for (int width : widths) {
            if (width < 1 || width > PlanParser.MAX_WIDTH) {
                throw BadInputException.of("--hidden", "--hidden: a layer of " + width + " is not accepted; expected"
                        + " comma-separated layer sizes 1.." + PlanParser.MAX_WIDTH + ", e.g. 32,16");
            }
        }
        return List.copyOf(widths);
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
            out.println("tail: last " + w.tail().length() + " updates, " + w.tail().snapshots() + " snapshots, "
                    + w.tailEpochEnds() + " epoch ends; tail loss spread " + fmt(w.tailLossSpread()));
            out.println("tail radius " + fmt(w.tailRadius()) + " over every update, " + fmt(w.tailRadiusEpochEnds())
                    + " over the epoch ends" + (Double.isNaN(w.tailDistance()) ? "" : "; tail distance "
                    + fmt(w.tailDistance()) + " over every update, " + fmt(w.tailDistanceEpochEnds())
                    + " over the epoch ends"));
            if (!Double.isNaN(w.finalGap())) {
                out.println("final gap " + fmt(w.finalGap()) + ", final distance " + fmt(w.finalDistance())
                        + ", averaged gap " + fmt(w.averagedGap()));
            }
        }
        out.flush();
        return result;
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
     * Writes updates.csv (every update applied), {@value #EPOCHS_FILE} (every completed epoch) and final.csv (θ_T)
     * into {@code dir}, creating it; each file atomically, in the study files' CSV form (shortest round-trip numbers,
     * an empty cell where a value does not apply).
     */
    static void writeDump(Path dir, ReplicateResult result, int updatesPerEpoch) throws IOException {
        AtomicFile.write(dir.resolve("updates.csv"), stream -> {
            Writer w = new OutputStreamWriter(stream, StandardCharsets.UTF_8);
            w.write(Csv.line("epoch", "update", "rate"));
            double[] rates = result.rates();
            for (int t = 1; t <= rates.length; t++) {
                w.write(Csv.line(Integer.toString((t - 1) / updatesPerEpoch + 1), Integer.toString(t),
                        Csv.number(rates[t - 1])));
            }
            w.flush();
        });
        AtomicFile.write(dir.resolve(EPOCHS_FILE), stream -> {
            Writer w = new OutputStreamWriter(stream, StandardCharsets.UTF_8);
            w.write(Csv.line("epoch", "objective", "test_loss", "test_accuracy", "distance"));
            for (EpochRecord e : result.epochs()) {
                w.write(Csv.line(Integer.toString(e.epoch()), Csv.number(e.objective()), Csv.number(e.testLoss()),
                        Csv.number(e.testAccuracy()), Csv.number(e.distance())));
            }
            w.flush();
        });
        AtomicFile.write(dir.resolve("final.csv"), stream -> {
            Writer w = new OutputStreamWriter(stream, StandardCharsets.UTF_8);
            for (double v : result.finalParameters()) {
                w.write(Csv.line(NumberText.shortest(v)));
            }
            w.flush();
        });
    }

    private static String fmt(double v) {
        return Double.isNaN(v) ? "-" : String.format(Locale.ROOT, "%.8g", v);
    }

    private static String number(double v) {
        return v == Math.rint(v) && Math.abs(v) < 1e15 ? Long.toString((long) v) : Double.toString(v);
    }
}
