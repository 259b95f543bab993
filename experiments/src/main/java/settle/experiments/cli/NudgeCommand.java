package settle.experiments.cli;

import com.fasterxml.jackson.databind.JsonNode;
import com.fasterxml.jackson.databind.ObjectMapper;
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
import picocli.CommandLine.Parameters;
import picocli.CommandLine.Spec;
import settle.input.BadInputException;
import settle.reports.format.NudgeRecord;
import settle.experiments.manual.LockstepRunner;
import settle.experiments.manual.NudgeQueue;
import settle.experiments.manual.NudgeRequest;
import settle.reports.format.NudgesCsv;
import settle.experiments.manual.ProgressBoard;
import settle.experiments.plan.Plan;
import settle.experiments.plan.PlanParser;
import settle.experiments.study.StudyLock;
import settle.reports.format.StudyFormat;

/**
 * {@code settle nudge STUDY --arm NAME (--factor F | --rate R) [--note TEXT]}: asks the run of a study to
 * change a manual arm's rate from its next epoch on. The request goes into the study's {@code .nudge/} queue;
 * the runner applies it at the arm's next epoch end and records it in {@code nudges.csv}, and this command
 * waits a little for that acknowledgement and prints it. Exit 0 applied or queued, 2 refused (bad value,
 * unknown, finished or not-manual arm, not a study directory), 1 the request could not be written.
 */
@Command(name = "nudge", mixinStandardHelpOptions = true,
        description = "Change a manual arm's rate from its next epoch on, in a running study.")
public final class NudgeCommand implements Callable<Integer> {

    private static final ObjectMapper MAPPER = new ObjectMapper();
    private static final long POLL_MILLIS = 50;

    @Parameters(index = "0", paramLabel = "STUDY", description = "the study directory")
    Path study;

    @Option(names = "--arm", required = true, paramLabel = "NAME", description = "the manual arm to nudge")
    String arm;

    @ArgGroup(exclusive = true, multiplicity = "1")
    Change change;

    /** Exactly one of {@code --factor F} and {@code --rate R} (picocli refuses none or both with one line). */
    static final class Change {
        @Option(names = "--factor", required = true, paramLabel = "F",
                description = "multiply the arm's rates by F from its next epoch on")
        Double factor;

        @Option(names = "--rate", required = true, paramLabel = "R", description = "the rate wanted at the first"
                + " update of the next epoch (stored as the factor that gives it, so later updates follow the base"
                + " schedule's shape)")
        Double rate;
    }

    @Option(names = "--note", paramLabel = "TEXT", description = "recorded with the nudge in nudges.csv")
    String note = "";

    @Option(names = "--wait", paramLabel = "SECONDS", description = "how long to wait for the run to apply it"
            + " (default ${DEFAULT-VALUE})")
    double waitSeconds = 10;

    @Spec
    CommandSpec spec;

    @Override
    public Integer call() throws IOException, InterruptedException {
        PrintWriter out = spec.commandLine().getOut();
        Double factor = change.factor;
        Double rate = change.rate;
        if (factor != null) {
            NudgeRequest.checkPositive("--factor", factor);
        } else {
            NudgeRequest.checkPositive("--rate", rate);
        }
        if (!(waitSeconds >= 0) || waitSeconds > 86_400) {
            throw BadInputException.of("--wait", "--wait must be between 0 and 86400 seconds, got " + waitSeconds);
        }
        Path planFile = study.resolve(StudyFormat.PLAN);
        if (!Files.isRegularFile(planFile)) {
            throw BadInputException.inFile(study.toString(), "", "not a study directory (it has no " + StudyFormat.PLAN
                    + "); give the directory a run writes into, such as studies/<study>");
        }
        Plan plan = PlanParser.parse(planFile);
        int index = LockstepRunner.armIndex(plan, arm);
        if (index == 0 || !plan.arms().get(index - 1).manual() || finished(plan, index)) {
            throw BadInputException.of("--arm", LockstepRunner.refusal(plan, arm, index));
        }
        NudgeRequest request;
        try {
            request = NudgeQueue.submit(study, arm, factor == null ? Double.NaN : factor,
                    rate == null ? Double.NaN : rate, note);
        } catch (IOException e) {
            throw new IOException("cannot write the request into " + NudgeQueue.folder(study) + ": " + e.getMessage(),
                    e);
        }
        String asked = "arm '" + arm + "', " + request.describe();
        if (!StudyLock.heldByLiveProcess(study)) {
            out.println("queued " + asked + " (request " + request.id() + "): no run is live in " + study
                    + "; it applies when the study is run again, from the epoch after the one in progress then");
            return Main.OK;
        }
        long deadline = System.nanoTime() + (long) (waitSeconds * 1e9);
        while (true) {
            Optional<NudgeRecord> applied = applied(request.id());
            if (applied.isPresent()) {
                NudgeRecord n = applied.get();
                out.printf(Locale.ROOT, "applied %s: from epoch %d, factor %s (rate %s at its first update)%n", asked,
                        n.fromEpoch(), n.factor(), n.rate());
                return Main.OK;
            }
            Optional<String> refused = NudgeQueue.refusal(study, request.id());
            if (refused.isPresent()) {
                throw BadInputException.of("--arm", "refused: " + refused.get());
            }
            if (System.nanoTime() >= deadline) {
                out.println("queued " + asked + " (request " + request.id() + "): the run has not reached an epoch end"
                        + " of the arm within " + waitSeconds + " s; it applies from the epoch after the one then in"
                        + " progress (see nudges.csv or settle follow)");
                return Main.OK;
            }
            Thread.sleep(POLL_MILLIS);
        }
    }

    private Optional<NudgeRecord> applied(String id) {
        try {
            for (NudgeRecord n : NudgesCsv.read(study)) {
                if (n.request().equals(id)) {
                    return Optional.of(n);
                }
            }
        } catch (IOException | BadInputException e) {
            // being rewritten; read it again next time
        }
        return Optional.empty();
    }

    /** @return whether every replicate of the arm is written, or its replicates have run their last epoch */
    private boolean finished(Plan plan, int index) {
        boolean all = true;
        String id = settle.experiments.plan.PlanWriter.armId(plan.arms().get(index - 1));
        for (int r = 1; r <= plan.replicates() && all; r++) {
            all = Files.exists(StudyFormat.replicateFile(study, id, r));
        }
        if (all) {
            return true;
        }
        Path progress = study.resolve(ProgressBoard.FILE);
        if (!Files.exists(progress)) {
            return false;
        }
        try {
            JsonNode p = MAPPER.readTree(progress.toFile());
            for (JsonNode a : p.path("arms")) {
                if (a.path("index").asInt() == index && a.path("name").asText().equals(arm)) {
                    return a.path("state").asText().equals("finished")
                            || a.path("epoch").asInt(0) >= plan.training().epochs();
                }
            }
        } catch (IOException e) {
            return false;
        }
        return false;
    }
}
