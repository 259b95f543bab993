package settle.experiments.study;

import com.fasterxml.jackson.core.JsonGenerator;
import com.fasterxml.jackson.databind.JsonNode;
import com.fasterxml.jackson.databind.ObjectMapper;
import java.io.IOException;
import java.io.PrintStream;
import java.nio.file.Files;
import java.nio.file.Path;
import java.security.MessageDigest;
import java.time.Instant;
import java.util.ArrayList;
import java.util.List;
import java.util.Locale;
import java.util.Optional;
import java.util.HashMap;
import java.util.Map;
import java.util.concurrent.atomic.AtomicInteger;
import settle.datasets.Standardiser;
import settle.engine.schedule.NudgeLog;
import settle.experiments.manual.AppliedNudge;
import settle.experiments.manual.LockstepRunner;
import settle.experiments.manual.ManualArms;
import settle.experiments.manual.NudgeQueue;
import settle.experiments.manual.NudgeRequest;
import settle.experiments.manual.NudgesCsv;
import settle.experiments.manual.ProgressBoard;
import settle.experiments.run.LocalExecutor;
import settle.engine.minimum.Curvature;
import settle.engine.minimum.Minimum;
import settle.engine.train.ReplicateResult;
import settle.engine.train.ReplicateSeeds;
import settle.experiments.plan.ArmPlan;
import settle.experiments.plan.GridExpansion;
import settle.experiments.plan.Plan;
import settle.experiments.plan.PlanData;
import settle.experiments.plan.PlanWriter;
import settle.experiments.run.Progress;
import settle.experiments.run.ReplicateExecutor;
import settle.experiments.run.ReplicateKey;
import settle.experiments.run.ReplicateOutcome;
import settle.experiments.run.ReplicateWork;
import settle.reports.Report;

/**
 * Runs a plan into its study directory: takes the lock, refuses a plan or data that changed under an existing
 * study (unless fresh), writes {@code plan.yaml}, {@code reference.json} and {@code manifest.json}, trains every
 * replicate that has no file yet, writes each atomically as it finishes, then assembles {@code epochs.csv} and
 * completes the manifest. A run killed at any moment loses only the replicates in flight; running it again
 * finishes the rest, and every replicate file equals an uninterrupted run's.
 */
public final class StudyRunner {

    /**
     * What a run ended with.
     *
     * @param reportProblem one line saying why report.html was not written, or which of its sections could not be
     *     drawn; "" when the whole report was written
     * @param report what the report wrote (its paths and the verdict), or null when it was not written
     */
    public record Outcome(Path directory, int total, int finished, int diverged, int missing, int ranNow,
            String reportProblem, Report.Outcome report) {

        /**
         * @return 0 all finished; 3 some diverged or missing; 1 every replicate diverged, or the report was not
         *     written whole (the replicates are kept either way)
         */
        public int exitCode() {
            if (diverged == total && total > 0 || !reportProblem.isEmpty()) {
                return 1;
            }
            return diverged > 0 || missing > 0 ? 3 : 0;
        }
    }

    /** The plan or its data changed under an existing study directory. */
    public static final class ChangedPlanException extends IllegalArgumentException {
        ChangedPlanException(String message) {
            super(message);
        }
    }

    /**
     * An existing study directory (or a replicate file in it) written in an older format: its numbers mean something
     * else, so this run neither resumes it nor writes beside it.
     */
    public static final class OlderFormatException extends IllegalArgumentException {
        OlderFormatException(String message) {
            super(message);
        }
    }

    private static final ObjectMapper MAPPER = new ObjectMapper();

    private final StudyContext context;
    private final Path directory;
    private final ReplicateExecutor executor;
    private final List<String> commandLine;
    private final PrintStream err;
    private final Progress.Mode progressMode;
    private final long paceMillis;
    /** The grid structure the manifest records: the plan's, or the one an earlier run of this study recorded. */
    private List<GridExpansion> grids = List.of();

    /**
     * @param context the plan, its data and trainers
     * @param directory the study directory (created when missing)
     * @param executor where replicates run
     * @param commandLine the command as typed, for the manifest
     * @param err where progress and notes go
     */
    public StudyRunner(StudyContext context, Path directory, ReplicateExecutor executor, List<String> commandLine,
            PrintStream err, Progress.Mode progressMode) {
        this(context, directory, executor, commandLine, err, progressMode, 0);
    }

    /**
     * @param paceMillis manual arms: the least time between two epoch ends, so that a person can follow and
     *     nudge a short study (0: as fast as they train); results do not depend on it
     */
    public StudyRunner(StudyContext context, Path directory, ReplicateExecutor executor, List<String> commandLine,
            PrintStream err, Progress.Mode progressMode, long paceMillis) {
        if (paceMillis < 0) {
            throw new IllegalArgumentException("--pace must be at least 0 milliseconds: " + paceMillis);
        }
        this.paceMillis = paceMillis;
        this.context = context;
        this.directory = directory;
        this.executor = executor;
        this.commandLine = List.copyOf(commandLine);
        this.err = err;
        this.progressMode = progressMode;
    }

    /**
     * Runs the study.
     *
     * @param fresh discard an existing study's results first
     * @throws ChangedPlanException when the plan or data differ from the existing study's and not fresh
     * @throws StudyLock.LockHeldException when another live run holds the directory
     */
    public Outcome run(boolean fresh) throws Exception {
        Plan plan = context.plan();
        String planHash = PlanWriter.sha256(plan);
        String dataHash = Hashes.of(context.data().all());
        String splitHash = splitHash(context.data());
        try (StudyLock lock = StudyLock.acquire(directory)) {
            Path manifestFile = directory.resolve("manifest.json");
            if (!fresh) {
                refuseOlderFormat(manifestFile);
            }
            grids = context.parsed().grids();
            if (Files.exists(manifestFile) && !fresh) {
                refuseChanged(manifestFile, planHash, dataHash, splitHash);
                if (grids.isEmpty()) {
                    grids = recordedGrids(manifestFile);
                }
            }
            if (fresh) {
                clear();
            }
            List<Integer> manualArms = ManualArms.indices(plan);
            if (!manualArms.isEmpty() && !(executor instanceof LocalExecutor)) {
                ManualArms.refuseUnlessLocal(plan, executor.describe());
            }
            String started = Instant.now().toString();
            PlanWriter.write(plan, directory.resolve("plan.yaml"));
            if (context.minimum() != null) {
                AtomicFiles.write(directory.resolve("reference.json"), referenceJson());
            }
            Map<Integer, Integer> resume = resumeEpochs(manualArms);
            List<AppliedNudge> logged = replayLoggedNudges();
            List<ReplicateKey> all = context.keys();
            List<ReplicateKey> missing = new ArrayList<>();
            List<ReplicateKey> manualMissing = new ArrayList<>();
            ProgressBoard board = new ProgressBoard(directory, plan);
            int[] present = new int[plan.arms().size() + 1];
            int[] presentDiverged = new int[plan.arms().size() + 1];
            for (ReplicateKey key : all) {
                Path file = directory.resolve(ReplicateFile.relativePath(key));
                AtomicFiles.removeLeftovers(file.getParent());
                if (!Files.exists(file)) {
                    (plan.arms().get(key.arm() - 1).manual() ? manualMissing : missing).add(key);
                } else {
                    present[key.arm()]++;
                    if ("diverged".equals(MAPPER.readTree(file.toFile()).path("status").asText())) {
                        presentDiverged[key.arm()]++;
                    }
                }
            }
            for (int a = 1; a <= plan.arms().size(); a++) {
                board.state(a, present[a] == plan.replicates() ? ProgressBoard.State.FINISHED
                        : ProgressBoard.State.PENDING, present[a], presentDiverged[a]);
            }
            board.write();
            if (!manualArms.isEmpty()) {
                ManualArms.writeReplay(directory, plan, logs());
            }
            writeManifest(started, null, planHash, dataHash, splitHash);
            int toRun = missing.size() + manualMissing.size();
            Progress progress = new Progress(err, progressMode, all.size(), all.size() - toRun);
            ReplicateWork work = new LocalWork(context);
            AtomicInteger written = new AtomicInteger(all.size() - toRun);
            // Ctrl-C (or any signal that lets the JVM run its hooks): every replicate file is whole, since each
            // is renamed into place; say what is kept and how to go on. The JVM then exits with 130.
            Thread onInterrupt = new Thread(() -> {
                err.println();
                err.println("settle: interrupted; " + written.get() + " of " + all.size()
                        + " replicates are written and kept in " + directory + "; run the same command again to train the rest");
                err.flush();
            }, "settle-interrupt-note");
            Runtime.getRuntime().addShutdownHook(onInterrupt);
            ReplicateExecutor.Sink sink = outcome -> {
                AtomicFiles.write(directory.resolve(ReplicateFile.relativePath(outcome.key())), outcome.file());
                written.incrementAndGet();
                progress.finished(outcome);
                board.replicateWritten(outcome.key().arm(), outcome.diverged());
                board.write();
            };
            try {
                new LockstepRunner(context, directory, board, executor.parallelism(), paceMillis, logged, resume)
                        .run(manualMissing, sink::accept);
                executor.runAll(missing, work, sink);
                refuseLeftoverNudges();
            } finally {
                try {
                    Runtime.getRuntime().removeShutdownHook(onInterrupt);
                } catch (IllegalStateException shuttingDown) {
                    // the hook is running or has run: nothing to undo
                }
                progress.close();
                board.ended();
                board.write();
            }
            missing.addAll(manualMissing);
            EpochsTable.write(directory, plan, all);
            Outcome outcome = writeManifest(started, Instant.now().toString(), planHash, dataHash, splitHash);
            ReportWritten report = writeReport();
            return new Outcome(directory, outcome.total(), outcome.finished(), outcome.diverged(), outcome.missing(),
                    missing.size(), report.problem(), report.outcome());
        }
    }

    /**
     * Builds report.html and summary.csv from the finished study directory.
     *
     * @return what was written (null when nothing was) and the problem: "" when the whole report was written, else
     *     one line saying what was not (the run then exits 1: a study whose report is missing has not finished its
     *     work, though its replicates are kept)
     */
    private ReportWritten writeReport() {
        String rebuild = "the replicates are kept; rebuild it with settle report " + directory;
        try {
            Report.Outcome written = Report.write(directory);
            if (!written.failedSections().isEmpty()) {
                return new ReportWritten(written, "the report was written, but these sections could not be drawn: "
                        + String.join("; ", written.failedSections()) + " (a fault in settle: each says so in its place)");
            }
            return new ReportWritten(written, "");
        } catch (IOException | RuntimeException e) {
            String why = e.getMessage() == null ? e.toString() : e.getMessage();
            return new ReportWritten(null, "the report was not written: " + why.replace('\n', ' ') + "; " + rebuild);
        }
    }

    /** The report a run wrote, or null, and one line on what went wrong ("" when nothing did). */
    private record ReportWritten(Report.Outcome outcome, String problem) {
    }

    /**
     * Refuses to resume a study directory whose manifest or replicate files are in an older format than this settle
     * writes, before anything is written into it.
     */
    private void refuseOlderFormat(Path manifestFile) throws IOException {
        List<Path> files = new ArrayList<>();
        if (Files.isRegularFile(manifestFile)) {
            files.add(manifestFile);
        }
        Path arms = directory.resolve("arms");
        if (Files.isDirectory(arms)) {
            try (var walk = Files.walk(arms, 2)) {
                walk.filter(f -> f.getFileName().toString().endsWith(".json") && Files.isRegularFile(f)).sorted()
                        .forEach(files::add);
            }
        }
        for (Path file : files) {
            JsonNode node;
            try {
                node = MAPPER.readTree(file.toFile());
            } catch (IOException e) {
                continue; // an unreadable manifest is refused as such below; a broken replicate file is retrained
            }
            int format = node.path("format").asInt(ReplicateFile.FORMAT);
            if (format < ReplicateFile.FORMAT) {
                throw new OlderFormatException(settle.reports.format.StudyReader.olderFormat(file, format, rerun()));
            }
        }
    }

    /** @return the command as typed with {@code --fresh} added: what rewrites the study in this format */
    private String rerun() {
        if (commandLine.isEmpty()) {
            return "settle run PLAN --fresh";
        }
        StringBuilder b = new StringBuilder();
        for (String arg : commandLine) {
            b.append(b.length() == 0 ? "" : " ")
                    .append(arg.isEmpty() || arg.matches(".*[\\s'\"].*") ? "'" + arg.replace("'", "'\\''") + "'" : arg);
        }
        return b.append(" --fresh").toString();
    }

    /** Trains replicates in this JVM from a shared context. */
    private static final class LocalWork implements ReplicateWork {
        private final transient StudyContext context;

        LocalWork(StudyContext context) {
            this.context = context;
        }

        @Override
        public ReplicateOutcome run(ReplicateKey key) {
            return outcome(context, key);
        }
    }

    /** @return the finished replicate {@code key} of {@code context}, as its file's bytes */
    public static ReplicateOutcome outcome(StudyContext context, ReplicateKey key) {
        ReplicateResult result = context.train(key);
        return new ReplicateOutcome(key, ReplicateFile.of(context, key, result), result.diverged(),
                result.rates().length);
    }

    private void refuseChanged(Path manifestFile, String planHash, String dataHash, String splitHash) throws IOException {
        JsonNode old;
        try {
            old = MAPPER.readTree(manifestFile.toFile());
        } catch (IOException e) {
            throw new ChangedPlanException(manifestFile + ": unreadable manifest of an existing study ("
                    + e.getMessage() + "); run with --fresh to start the study again");
        }
        List<String> changed = new ArrayList<>();
        if (!planHash.equals(old.path("plan_sha256").asText())) {
            changed.add("the plan");
        }
        if (!dataHash.equals(old.path("data_sha256").asText())) {
            changed.add("the data");
        }
        if (!splitHash.equals(old.path("split_sha256").asText())) {
            changed.add("the split");
        }
        if (!changed.isEmpty()) {
            throw new ChangedPlanException(directory + ": " + String.join(" and ", changed)
                    + " changed since this study was run; use --fresh to discard its results, or --out DIR for a new study");
        }
    }

    private void clear() throws IOException {
        Path arms = directory.resolve("arms");
        if (Files.exists(arms)) {
            try (var walk = Files.walk(arms)) {
                List<Path> paths = walk.sorted((a, b) -> b.getNameCount() - a.getNameCount()).toList();
                for (Path p : paths) {
                    Files.deleteIfExists(p);
                }
            }
        }
        for (String name : List.of("manifest.json", "reference.json", "epochs.csv", "summary.csv", "report.html",
                "plan.yaml", ProgressBoard.FILE, NudgesCsv.FILE, ManualArms.REPLAY_FILE)) {
            Files.deleteIfExists(directory.resolve(name));
        }
        NudgeQueue.clear(directory);
    }

    /** @return every arm's nudge log (null for arms without nudges), index 0 = arm 1 */
    private List<NudgeLog> logs() {
        List<NudgeLog> logs = new ArrayList<>();
        for (int a = 1; a <= context.plan().arms().size(); a++) {
            logs.add(context.nudgeLog(a));
        }
        return logs;
    }

    /**
     * Puts the nudges recorded in {@code nudges.csv} (by the run this one resumes) back into the manual arms'
     * logs, so the replicates still to train replay them.
     */
    private List<AppliedNudge> replayLoggedNudges() throws IOException {
        List<AppliedNudge> logged = NudgesCsv.read(directory);
        Plan plan = context.plan();
        for (int a = 1; a <= plan.arms().size(); a++) {
            if (context.nudgeLog(a) != null) {
                context.nudgeLog(a).replaceAll(plan.arms().get(a - 1).nudges());
            }
        }
        for (AppliedNudge n : logged) {
            int a = n.armIndex();
            if (a > plan.arms().size() || !plan.arms().get(a - 1).name().equals(n.arm())
                    || !plan.arms().get(a - 1).manual()) {
                throw new ChangedPlanException(directory.resolve(NudgesCsv.FILE) + ": a nudge of arm " + a + " '"
                        + n.arm() + "', which is not a manual arm of this plan; use --fresh to discard the study");
            }
            context.nudgeLog(a).append(new NudgeLog.Entry(n.fromEpoch(), n.factor(), n.note()));
        }
        return logged;
    }

    /**
     * @return per manual arm, the first epoch at whose end a waiting request may apply: the epoch that was in
     *     progress when the run this one resumes stopped (from its progress.json), else 1
     */
    private Map<Integer, Integer> resumeEpochs(List<Integer> manualArms) {
        Map<Integer, Integer> out = new HashMap<>();
        Path file = directory.resolve(ProgressBoard.FILE);
        if (manualArms.isEmpty() || !Files.exists(file)) {
            return out;
        }
        try {
            JsonNode old = MAPPER.readTree(file.toFile());
            for (JsonNode arm : old.path("arms")) {
                int index = arm.path("index").asInt();
                if (manualArms.contains(index) && arm.path("name").asText().equals(
                        context.plan().arms().get(index - 1).name())) {
                    out.put(index, arm.path("epoch").asInt(0) + 1);
                }
            }
        } catch (IOException | RuntimeException e) {
            err.println("settle: note: " + file + " is unreadable (" + e.getMessage() + "); waiting nudges apply"
                    + " from the first epoch end");
        }
        return out;
    }

    /** Refuses the requests still waiting when the run ends: no arm of it trains any more. */
    private void refuseLeftoverNudges() throws IOException {
        NudgeQueue.Pending pending = NudgeQueue.pending(directory);
        for (NudgeQueue.Unreadable u : pending.unreadable()) {
            NudgeQueue.refuse(directory, u.id(), u.reason());
        }
        for (NudgeRequest r : pending.requests()) {
            NudgeQueue.refuse(directory, r.id(), LockstepRunner.refusal(context.plan(), r.arm(),
                    LockstepRunner.armIndex(context.plan(), r.arm())));
        }
    }

    private static String splitHash(PlanData data) {
        MessageDigest d = Hashes.sha256();
        Hashes.text(d, "train");
        Hashes.feed(d, data.train());
        Hashes.text(d, "test");
        Hashes.feed(d, data.test());
        if (data.holdout() != null) {
            Hashes.text(d, "holdout");
            Hashes.feed(d, data.holdout());
        }
        return Hashes.hex(d);
    }

    private byte[] referenceJson() {
        Minimum m = context.minimum();
        Optional<String> skip = Curvature.skipReason(context.model());
        Curvature c = context.curvature() != null ? context.curvature()
                : skip.isEmpty() ? Curvature.at(context.model(), context.data().train(), m.theta()) : null;
        Plan plan = context.plan();
        List<double[]> rates = new ArrayList<>();
        List<String> names = new ArrayList<>();
        for (var arm : plan.arms()) {
            rates.add(arm.schedule().schedule().plannedRates(context.shape()));
            names.add(arm.name());
        }
        AprioriBound bound = AprioriBound.of(plan, context.model(), context.data().train(), m.theta(), rates);
        return Json.document(g -> {
            g.writeStartObject();
            g.writeNumberField("format", ReplicateFile.FORMAT);
            g.writeStringField("model", context.model().describe());
            g.writeStringField("method", m.method().name().toLowerCase(Locale.ROOT));
            g.writeNumberField("iterations", m.iterations());
            g.writeBooleanField("converged", m.converged());
            Json.number(g, "objective", m.objective());
            Json.number(g, "gradient_norm", m.gradientNorm());
            Json.array(g, "theta", m.theta());
            if (c == null) {
                g.writeStringField("curvature_skipped", skip.orElse(""));
            } else {
                g.writeNumberField("gauge_dimension", c.gaugeDimension());
                Json.array(g, "eigenvalues", c.eigenvalues());
                Json.number(g, "lambda_min", c.lambdaMin());
                Json.number(g, "lambda_max", c.lambdaMax());
                Json.number(g, "stability_bound", c.stabilityBound(plan.training().momentum()));
            }
            bound.write(g, names);
            g.writeEndObject();
        });
    }

    private Outcome writeManifest(String started, String ended, String planHash, String dataHash, String splitHash)
            throws IOException {
        Plan plan = context.plan();
        PlanData data = context.data();
        List<ReplicateKey> keys = context.keys();
        String[] status = new String[keys.size()];
        int finished = 0;
        int diverged = 0;
        int missingCount = 0;
        for (int i = 0; i < keys.size(); i++) {
            Path file = directory.resolve(ReplicateFile.relativePath(keys.get(i)));
            if (!Files.exists(file)) {
                status[i] = ended == null ? "pending" : "missing";
                missingCount++;
            } else {
                status[i] = MAPPER.readTree(file.toFile()).path("status").asText();
                if ("diverged".equals(status[i])) {
                    diverged++;
                } else {
                    finished++;
                }
            }
        }
        byte[] manifest = Json.document(g -> {
            g.writeStartObject();
            g.writeNumberField("format", ReplicateFile.FORMAT);
            g.writeStringField("study", plan.study());
            g.writeObjectFieldStart("tool");
            g.writeStringField("name", "settle");
            g.writeStringField("version", Provenance.version());
            g.writeStringField("git_commit", Provenance.gitCommit());
            g.writeEndObject();
            g.writeObjectFieldStart("jvm");
            g.writeStringField("vendor", System.getProperty("java.vm.vendor", ""));
            g.writeStringField("name", System.getProperty("java.vm.name", ""));
            g.writeStringField("version", System.getProperty("java.runtime.version", System.getProperty("java.version", "")));
            g.writeEndObject();
            g.writeObjectFieldStart("cpu");
            g.writeStringField("model", Provenance.cpuModel());
            g.writeStringField("arch", System.getProperty("os.arch", ""));
            g.writeNumberField("cores", Runtime.getRuntime().availableProcessors());
            g.writeEndObject();
            g.writeStringField("executor", executor.describe());
            g.writeNumberField("threads", executor.parallelism());
            g.writeArrayFieldStart("command");
            for (String arg : commandLine) {
                g.writeString(arg);
            }
            g.writeEndArray();
            g.writeStringField("generator", ReplicateSeeds.ALGORITHM);
            g.writeNumberField("root_seed", plan.seed());
            g.writeStringField("started", started);
            if (ended == null) {
                g.writeNullField("ended");
            } else {
                g.writeStringField("ended", ended);
            }
            g.writeStringField("plan_sha256", planHash);
            g.writeStringField("data_sha256", dataHash);
            g.writeStringField("split_sha256", splitHash);
            g.writeObjectFieldStart("data");
            g.writeStringField("source", plan.data().source());
            g.writeNumberField("rows", data.all().rows());
            g.writeNumberField("features", data.all().features());
            g.writeArrayFieldStart("feature_names");
            for (String f : data.all().featureNames()) {
                g.writeString(f);
            }
            g.writeEndArray();
            g.writeArrayFieldStart("class_names");
            for (String c : data.all().classNames()) {
                g.writeString(c);
            }
            g.writeEndArray();
            g.writeNumberField("train_rows", data.train().rows());
            g.writeNumberField("test_rows", data.test().rows());
            g.writeNumberField("holdout_rows", data.holdout() == null ? 0 : data.holdout().rows());
            g.writeNumberField("updates_per_epoch", data.updatesPerEpoch(plan.training().batch()));
            g.writeEndObject();
            Standardiser s = data.standardiser();
            if (s == null) {
                g.writeNullField("standardisation");
            } else {
                g.writeObjectFieldStart("standardisation");
                Json.array(g, "means", s.means());
                Json.array(g, "scales", s.scales());
                g.writeEndObject();
            }
            g.writeStringField("model", context.model().describe());
            g.writeNumberField("parameters", context.model().parameterCount());
            g.writeNumberField("model_l2", plan.model().l2());
            g.writeStringField("reference", context.minimum() == null ? "none: the model is not convex" : "reference.json");
            g.writeStringField("baseline", plan.baseline());
            g.writeArrayFieldStart("arms");
            for (int a = 0; a < plan.arms().size(); a++) {
                g.writeStartObject();
                g.writeNumberField("index", a + 1);
                g.writeStringField("name", plan.arms().get(a).name());
                g.writeStringField("directory", "arms/" + (a + 1));
                g.writeEndObject();
            }
            g.writeEndArray();
            writeGrids(g, grids);
            g.writeArrayFieldStart("replicates");
            for (int i = 0; i < keys.size(); i++) {
                g.writeStartObject();
                g.writeNumberField("arm", keys.get(i).arm());
                g.writeNumberField("replicate", keys.get(i).replicate());
                g.writeStringField("status", status[i]);
                g.writeEndObject();
            }
            g.writeEndArray();
            g.writeEndObject();
        });
        AtomicFiles.write(directory.resolve("manifest.json"), manifest);
        return new Outcome(directory, keys.size(), finished, diverged, missingCount, 0, "", null);
    }

    /**
     * Writes the manifest's {@code grid}: per grid entry of the plan, the template arm, the swept keys with their
     * values as written, and each expanded arm's index (from 1) with its value of each key; an empty array for a
     * plan without a grid.
     */
    private static void writeGrids(JsonGenerator g, List<GridExpansion> grids) throws IOException {
        g.writeArrayFieldStart("grid");
        for (GridExpansion grid : grids) {
            g.writeStartObject();
            g.writeStringField("arm", grid.arm());
            g.writeArrayFieldStart("keys");
            for (int k = 0; k < grid.keys().size(); k++) {
                g.writeStartObject();
                g.writeStringField("name", grid.keys().get(k));
                g.writeArrayFieldStart("values");
                for (String v : grid.values().get(k)) {
                    g.writeString(v);
                }
                g.writeEndArray();
                g.writeEndObject();
            }
            g.writeEndArray();
            g.writeArrayFieldStart("arms");
            for (GridExpansion.Expanded e : grid.arms()) {
                g.writeStartObject();
                g.writeNumberField("index", e.index() + 1);
                g.writeArrayFieldStart("values");
                for (String v : e.values()) {
                    g.writeString(v);
                }
                g.writeEndArray();
                g.writeEndObject();
            }
            g.writeEndArray();
            g.writeEndObject();
        }
        g.writeEndArray();
    }

    /**
     * The grid an earlier run of this study recorded in its manifest, kept when the study is resumed from a plan that
     * has none: the study's own resolved {@code plan.yaml} has its grid expanded (and hashes the same as the plan
     * that expanded it), so running it again must not drop the structure. Empty when the manifest records none, or
     * records one that does not fit this plan's arms.
     */
    private List<GridExpansion> recordedGrids(Path manifestFile) throws IOException {
        JsonNode list = MAPPER.readTree(manifestFile.toFile()).path("grid");
        int arms = context.plan().arms().size();
        List<GridExpansion> out = new ArrayList<>();
        try {
            for (JsonNode grid : list) {
                List<String> keys = new ArrayList<>();
                List<List<String>> values = new ArrayList<>();
                for (JsonNode key : grid.path("keys")) {
                    keys.add(text(key.path("name")));
                    values.add(texts(key.path("values")));
                }
                List<GridExpansion.Expanded> expanded = new ArrayList<>();
                for (JsonNode arm : grid.path("arms")) {
                    int index = arm.path("index").asInt(0);
                    if (index < 1 || index > arms) {
                        return List.of();
                    }
                    expanded.add(new GridExpansion.Expanded(index - 1, texts(arm.path("values"))));
                }
                out.add(new GridExpansion(text(grid.path("arm")), keys, values, expanded));
            }
        } catch (IllegalArgumentException e) {
            return List.of(); // not this settle's grid record: nothing to keep
        }
        return out;
    }

    /** @return the strings of a JSON array; throws IllegalArgumentException for an element that is not one */
    private static List<String> texts(JsonNode array) {
        List<String> out = new ArrayList<>();
        for (JsonNode v : array) {
            out.add(text(v));
        }
        return out;
    }

    /** @return a JSON string's text; throws IllegalArgumentException for any other node */
    private static String text(JsonNode v) {
        if (!v.isTextual()) {
            throw new IllegalArgumentException("not a string: " + v);
        }
        return v.textValue();
    }
}
