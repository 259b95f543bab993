package settle.experiments.cli;

import java.io.IOException;
import java.io.PrintWriter;
import java.nio.file.Files;
import java.nio.file.Path;
import java.util.Locale;
import java.util.Optional;
import java.util.concurrent.Callable;
import picocli.CommandLine.ArgGroup;
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
import settle.engine.minimum.Curvature;
import settle.engine.minimum.Minimiser;
import settle.engine.minimum.Minimum;
import settle.engine.model.Model;
import settle.engine.model.ModelSpec;
import settle.experiments.plan.ParsedPlan;
import settle.experiments.plan.PlanData;
import settle.experiments.plan.PlanParser;
import settle.input.BadInputException;
import settle.reports.format.AtomicFile;
import settle.reports.format.NumberText;

/**
 * {@code settle minimum}: the exact minimiser θ* of the full-batch objective on the whole dataset ({@code --data}) or
 * on a plan's training split as its study prepares it ({@code --plan}), F(θ*), the gradient norm reached, the
 * iterations, H's extreme eigenvalues on the gauge-free subspace, and θ* by input name.
 */
@Command(
        name = "minimum",
        mixinStandardHelpOptions = true,
        versionProvider = Main.Version.class,
        defaultValueProvider = OptionDefaults.class,
        description = {
            "The exact minimiser θ* of F(θ) = (1/N) Σ loss_i + (λ/2)‖weights‖² (logistic models) on the whole"
                    + " of a dataset (--data), or on a plan's training split as its study prepares it (--plan): F(θ*),"
                    + " the gradient norm reached, H's extreme eigenvalues on the gauge-free subspace, and θ* by"
                    + " input name.",
            "Exit codes: 0 done; 1 no minimiser exists (λ = 0 on separable data) or the output could not be"
                    + " written; 2 bad input."})
public final class MinimumCommand implements Callable<Integer> {

    @Spec
    private CommandSpec spec;

    @ArgGroup(exclusive = true, multiplicity = "1")
    private Form form;

    /** Either a plan or data options, never both (picocli refuses a mix with one line). */
    static final class Form {
        @Option(names = "--plan", required = true, paramLabel = "PLAN",
                description = "the θ* of this plan's study: its model on its training split, the data prepared as a"
                        + " run prepares it (data keys, table encoding, standardisation on the training split);"
                        + " the θ* the study's reference.json records")
        Path plan;

        @ArgGroup(exclusive = false, multiplicity = "1", heading = "Or the whole of a dataset:%n")
        DataForm data;
    }

    /** {@code --data SOURCE} and the options it may take. */
    static final class DataForm extends DataOptions {
        @Option(names = "--model", paramLabel = "KIND",
                description = "logistic (the only kind with an exact minimiser; default ${DEFAULT-VALUE})")
        ModelSpec.Kind model;
    }

    @Option(names = "--out", paramLabel = "FILE",
            description = "write θ* to FILE, one value per line, instead of printing it")
    private Path out;

    @Override
    public Integer call() throws IOException {
        PrintWriter stdout = spec.commandLine().getOut();
        PrintWriter stderr = spec.commandLine().getErr();
        if (out != null && Files.isDirectory(out)) {
            throw BadInputException.of("--out", "--out " + out + " is a directory; expected the file to write θ* to");
        }
        Dataset dataset;
        ModelSpec modelSpec;
        String described;
        if (form.plan != null) {
            ParsedPlan parsed = PlanParser.read(form.plan);
            modelSpec = parsed.plan().model();
            if (modelSpec.kind() != ModelSpec.Kind.LOGISTIC) {
                throw parsed.error("model.kind", modelSpec.kind().key() + " has no exact minimiser;"
                        + " settle minimum accepts " + ModelSpec.Kind.LOGISTIC.key());
            }
            PlanData data = PlanData.load(parsed);
            for (String warning : parsed.warnings()) {
                stderr.println("warning: " + warning);
            }
            for (String warning : data.warnings()) {
                stderr.println("warning: " + warning);
            }
            dataset = data.train();
            described = dataset + " from " + form.plan + (parsed.plan().data().standardize()
                    ? ", standardised on the training split" : "");
        } else {
            DataForm data = form.data;
            if (data.model != ModelSpec.Kind.LOGISTIC) {
                throw BadInputException.of("--model", "--model " + data.model.key() + " has no exact minimiser;"
                        + " accepted: " + ModelSpec.Kind.LOGISTIC.key());
            }
            data.check();
            modelSpec = ModelSpec.logistic(data.l2);
            // a CSV table takes the default table keys (text columns one-hot over every row, gaps refused): a
            // table with gaps or keys of its own goes through --plan
            PreparedData prepared;
            try {
                prepared = DataSources.prepare(data.source, data.label, TableOptions.DEFAULTS, null, SplitRule.NONE);
            } catch (BadInputException e) {
                if (!e.key().startsWith("data.")) {
                    throw e;
                }
                throw BadInputException.at(e.file(), e.line(), e.column(), e.key(), e.detail() + "; --data takes"
                        + " every data key's default: set " + e.key() + " in a plan and give it as --plan PLAN");
            }
            for (String warning : prepared.warnings()) {
                stderr.println("warning: " + warning);
            }
            dataset = prepared.all();
            if (data.standardize) {
                Standardiser standardiser = Standardiser.fit(dataset);
                for (String warning : standardiser.warnings()) {
                    stderr.println("warning: " + warning);
                }
                dataset = standardiser.apply(dataset);
            }
            described = dataset + (data.standardize ? ", standardised on all rows" : "");
        }
        double l2 = modelSpec.l2();
        Model built = modelSpec.build(dataset.features(), dataset.classes());
        Minimum minimum = new Minimiser().minimise(built, dataset);

        stdout.println("data: " + described);
        stdout.println("model: " + built.describe() + ", l2 " + l2);
        stdout.println("method: " + minimum.method().name().toLowerCase(Locale.ROOT) + ", " + minimum.iterations()
                + " iterations, " + (minimum.converged() ? "converged" : "stopped before the tolerance"));
        stdout.println("F(θ*): " + minimum.objective());
        stdout.println(String.format(Locale.ROOT, "gradient norm reached (max |∇F|): %.3e (tolerance %.0e)",
                minimum.gradientNorm(), Minimiser.GRADIENT_TOLERANCE));
        if (!minimum.converged()) {
            stderr.println(String.format(Locale.ROOT, "warning: the iterates stopped improving at max |∇F| = %.3e,"
                    + " above the tolerance %.0e (rounding); θ* is the best point found",
                    minimum.gradientNorm(), Minimiser.GRADIENT_TOLERANCE));
        }
        Optional<String> skip = Curvature.skipReason(built);
        if (skip.isPresent()) {
            stdout.println("H: " + skip.get());
        } else {
            Curvature curvature = Curvature.at(built, dataset, minimum.theta());
            stdout.println(String.format(Locale.ROOT,
                    "H eigenvalues on the gauge-free subspace (%d of %d directions): min %.6e, max %.6e;"
                            + " stability bound 2/max %.6e",
                    curvature.eigenvalues().length, curvature.parameterCount(), curvature.lambdaMin(),
                    curvature.lambdaMax(), curvature.stabilityBound()));
        }

        double[] theta = minimum.theta();
        if (out != null) {
            StringBuilder text = new StringBuilder();
            for (double v : theta) {
                text.append(NumberText.shortest(v)).append('\n');
            }
            try {
                AtomicFile.write(out, text.toString());
            } catch (IOException e) {
                throw new IOException("cannot write " + out + ": " + e.getMessage(), e);
            }
            stdout.println("θ*: " + theta.length + " values written to " + out);
        } else {
            stdout.println("θ* (" + theta.length + " values, " + order(built) + "):");
            settle.reports.metrics.Coefficients co = settle.reports.metrics.Coefficients.of(theta, dataset.features(),
                    dataset.classNames());
            java.util.List<String> labels = co == null ? null : co.labels(dataset.featureNames());
            for (int i = 0; i < theta.length; i++) {
                stdout.println(labels == null ? Double.toString(theta[i]) : theta[i] + "  " + labels.get(i));
            }
        }
        return Main.OK;
    }

    private static String order(Model model) {
        return model.classes() == 2
                ? "the " + model.inputs() + " weights, then the bias"
                : "class 0's " + model.inputs() + " weights, class 1's, …, then the " + model.classes() + " biases";
    }
}
