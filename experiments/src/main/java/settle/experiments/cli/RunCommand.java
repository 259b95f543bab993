package settle.experiments.cli;

import com.fasterxml.jackson.core.JsonFactory;
import com.fasterxml.jackson.core.JsonGenerator;
import java.io.IOException;
import java.io.PrintStream;
import java.io.PrintWriter;
import java.io.StringWriter;
import java.io.UncheckedIOException;
import java.nio.file.Path;
import java.util.ArrayList;
import java.util.List;
import java.util.concurrent.Callable;
import picocli.CommandLine.Command;
import picocli.CommandLine.Model.CommandSpec;
import picocli.CommandLine.Option;
import picocli.CommandLine.Parameters;
import picocli.CommandLine.Spec;
import settle.engine.minimum.NoMinimiserException;
import settle.experiments.plan.ParsedPlan;
import settle.experiments.plan.PlanParser;
import settle.experiments.run.LocalExecutor;
import settle.experiments.run.Progress;
import settle.experiments.run.ReplicateExecutor;
import settle.experiments.study.ClusterExecutorFactory;
import settle.experiments.study.StudyContext;
import settle.experiments.study.StudyLock;
import settle.experiments.study.StudyRunner;
import settle.input.BadInputException;
import settle.reports.Report;

/**
 * {@code settle run PLAN}: trains every arm × replicate of a plan into its study directory, resuming what a
 * killed run left. Exit 0 when every replicate finished, 3 when some diverged, 1 when all diverged or the
 * work failed (the report not written whole included: one line says why), 2 for bad input (a directory in an older
 * format included).
 */
@Command(name = "run", mixinStandardHelpOptions = true,
        description = "Run a plan: every arm over the same seeds, into a study directory.")
public final class RunCommand implements Callable<Integer> {

    @Parameters(index = "0", paramLabel = "PLAN", description = "the plan YAML file")
    Path planFile;

    @Option(names = "--out", paramLabel = "DIR", description = "the study directory (default: studies/<study>)")
    Path out;

    @Option(names = "--threads", paramLabel = "N", description = "replicates trained at once, a replicate of the arms that train together counting as one (default: the core count, ${DEFAULT-VALUE})")
    int threads = Runtime.getRuntime().availableProcessors();

    @Option(names = "--cluster", paramLabel = "MASTER",
            description = "run the replicates as Apache Spark tasks on MASTER (local[N], spark://HOST:PORT, yarn);"
                    + " needs the cluster build (docs/cluster.md)")
    String cluster;

    @Option(names = "--fresh", description = "discard the results of an existing study in the directory first")
    boolean fresh;

    @Option(names = "--arms-apart", description = "train each arm's replicates on their own instead of together with"
            + " the arms that share their mini-batches (the same files, byte for byte; for comparing speed)")
    boolean armsApart;

    @Option(names = "--quiet", description = "no progress display")
    boolean quiet;

    @Option(names = "--json", description = "print a machine-readable summary on stdout")
    boolean json;

    @Option(names = "--pace", paramLabel = "MS", description = "manual arms: at least MS milliseconds between two"
            + " epoch ends, so that a short study can be followed and nudged by hand (default 0); results do not"
            + " depend on it")
    long pace;

    @Spec
    CommandSpec spec;

    @Override
    public Integer call() throws Exception {
        List<String> command = new ArrayList<>();
        command.add("settle");
        command.addAll(spec.commandLine().getParseResult().originalArgs());
        if (cluster != null && spec.commandLine().getParseResult().hasMatchedOption("--threads")) {
            spec.commandLine().getErr().println("warning: --threads is ignored with --cluster: the cluster's cores"
                    + " decide how many replicates run at once");
        }
        return execute(spec, () -> PlanParser.read(planFile), out, threads, cluster, fresh, quiet, json, command, pace, armsApart);
    }

    /** Supplies the parsed plan (from a file, or the bundled demo). */
    @FunctionalInterface
    interface PlanSource {
        ParsedPlan read();
    }

    /**
     * Shared by {@code run} and {@code demo}.
     *
     * @param cluster the cluster's master for {@code --cluster}, or null to train on local threads
     * @param pace at least this many milliseconds between two epoch ends of a manual arm (0: no pause)
     * @param armsApart train each arm's replicates on their own rather than with the arms sharing their batches
     */
    static int execute(CommandSpec spec, PlanSource source, Path out, int threads, String cluster, boolean fresh,
            boolean quiet, boolean json, List<String> command, long pace, boolean armsApart) throws Exception {
        PrintWriter stdout = spec.commandLine().getOut();
        PrintWriter stderr = spec.commandLine().getErr();
        if (threads < 1) {
            throw BadInputException.of("--threads", "--threads must be at least 1: " + threads);
        }
        if (pace < 0) {
            throw BadInputException.of("--pace", "--pace must be at least 0 milliseconds: " + pace);
        }
        StudyRunner.Outcome outcome;
        ClusterExecutorFactory factory = cluster == null ? null : ClusterExecutorFactory.find();
        ParsedPlan parsed = source.read();
        for (String w : parsed.warnings()) {
            stderr.println("warning: " + w);
        }
        if (factory != null) {
            ClusterExecutorFactory.refuseManualArms(parsed);
        }
        StudyContext context = StudyContext.build(parsed);
        for (String w : context.data().warnings()) {
            stderr.println("warning: " + w);
        }
        Path directory = out != null ? out : Places.study(parsed.plan().study());
        stderr.flush();
        PrintStream progressStream = System.err;
        ReplicateExecutor executor = factory == null ? new LocalExecutor(threads) : factory.create(cluster, context);
        try {
            StudyRunner runner = new StudyRunner(context, directory, executor, command, progressStream, stderr,
                    quiet ? Progress.Mode.QUIET : Terminal.STDERR.isTerminal() ? Progress.Mode.BAR
                    : Progress.Mode.LINES, pace).armsTogether(!armsApart);
            outcome = runner.run(fresh);
        } finally {
            if (executor instanceof AutoCloseable closeable) {
                closeable.close();
            }
        }
        int code = outcome.exitCode();
        String where = outcome.directory().toString();
        if (!outcome.reportProblem().isEmpty()) {
            stderr.println("settle run: " + outcome.reportProblem());
        }
        Report.Outcome report = outcome.report();
        if (json) {
            stdout.println(summaryJson(outcome, code));
        } else {
            if (!quiet) {
                stderr.printf("settle: %d of %d replicates finished, %d diverged; study directory %s%n",
                        outcome.finished(), outcome.total(), outcome.diverged(), where);
                stderr.flush();
            }
            if (report != null) {
                printVerdict(stdout, report);
            }
        }
        return code;
    }

    /** Prints the verdict's lines and the report's path: what {@code run}, {@code demo} and {@code report} end with. */
    static void printVerdict(PrintWriter out, Report.Outcome report) {
        for (String line : report.verdict().lines()) {
            out.println(line);
        }
        out.println("report: " + report.report().toAbsolutePath().normalize());
    }

    /**
     * @return the one-line JSON summary of {@code --json}: {@code study}, {@code replicates}, {@code finished},
     *     {@code diverged}, {@code missing}, {@code trained_now}, {@code exit_code}, {@code report} (its path, or null
     *     when it was not written) and the verdict's fields ({@link settle.reports.metrics.VerdictSummary})
     */
    static String summaryJson(StudyRunner.Outcome outcome, int code) {
        StringWriter text = new StringWriter();
        try (JsonGenerator g = new JsonFactory()
                .createGenerator(text)) {
            g.writeStartObject();
            g.writeStringField("study", outcome.directory().toString());
            g.writeNumberField("replicates", outcome.total());
            g.writeNumberField("finished", outcome.finished());
            g.writeNumberField("diverged", outcome.diverged());
            g.writeNumberField("missing", outcome.missing());
            g.writeNumberField("trained_now", outcome.ranNow());
            g.writeNumberField("exit_code", code);
            Report.Outcome report = outcome.report();
            if (report == null) {
                g.writeNullField("report");
            } else {
                g.writeStringField("report", report.report().toAbsolutePath().normalize().toString());
                report.verdict().writeJsonFields(g);
            }
            g.writeEndObject();
        } catch (IOException e) {
            throw new UncheckedIOException(e);
        }
        return text.toString();
    }
}
