package settle.experiments.cli;

import java.io.IOException;
import java.io.InputStream;
import java.io.UncheckedIOException;
import java.nio.charset.StandardCharsets;
import java.nio.file.Path;
import java.util.ArrayList;
import java.util.List;
import java.util.concurrent.Callable;
import picocli.CommandLine.Command;
import picocli.CommandLine.Model.CommandSpec;
import picocli.CommandLine.Option;
import picocli.CommandLine.Spec;
import settle.experiments.plan.ParsedPlan;
import settle.experiments.plan.PlanParser;

/**
 * {@code settle demo}: runs the bundled demo plan ({@code experiments/plans/demo.yaml}, an orchard's frost alarm
 * on invented data) end to end and prints where its study directory is.
 */
@Command(name = "demo", mixinStandardHelpOptions = true,
        description = "Run the bundled demo study end to end and print where its results are.")
public final class DemoCommand implements Callable<Integer> {

    /** Classpath location of the demo plan (a copy of experiments/plans/demo.yaml). */
    static final String PLAN_RESOURCE = "/settle/experiments/plans/demo.yaml";

    @Option(names = "--out", paramLabel = "DIR", description = "the study directory (default: studies/frost-demo)")
    Path out;

    @Option(names = "--threads", paramLabel = "N", description = "replicates trained at once (default: the core count, ${DEFAULT-VALUE})")
    int threads = Runtime.getRuntime().availableProcessors();

    @Option(names = "--arms-apart", description = "train each arm's replicates on their own instead of together with"
            + " the arms that share their mini-batches (the same files, byte for byte; for comparing speed)")
    boolean armsApart;

    @Option(names = "--quiet", description = "no progress display")
    boolean quiet;

    @Spec
    CommandSpec spec;

    /** @return the text of the bundled demo plan */
    static String planText() {
        try (InputStream in = DemoCommand.class.getResourceAsStream(PLAN_RESOURCE)) {
            if (in == null) {
                throw new IllegalStateException("the demo plan " + PLAN_RESOURCE + " is missing from the jar");
            }
            return new String(in.readAllBytes(), StandardCharsets.UTF_8);
        } catch (IOException e) {
            throw new UncheckedIOException(e);
        }
    }

    @Override
    public Integer call() throws Exception {
        List<String> command = new ArrayList<>();
        command.add("settle");
        command.addAll(spec.commandLine().getParseResult().originalArgs());
        ParsedPlan plan = PlanParser.read(planText(), "demo.yaml", Path.of(""));
        int code = RunCommand.execute(spec, () -> plan, out, threads, null, true, quiet, false, command, 0, armsApart);
        if (code == Main.OK || code == Main.INCOMPLETE) {
            Path where = out != null ? out : Places.study(plan.plan().study());
            spec.commandLine().getOut().println("demo study written to " + where.toAbsolutePath().normalize());
        }
        return code;
    }
}
