package settle.experiments.study;

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
import java.util.concurrent.atomic.AtomicInteger;
import settle.datasets.Standardiser;
import settle.engine.minimum.Curvature;
import settle.engine.minimum.Minimum;
import settle.engine.train.ReplicateResult;
import settle.engine.train.ReplicateSeeds;
import settle.experiments.plan.ArmPlan;
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

    /** What a run ended with. */
    public record Outcome(Path directory, int total, int finished, int diverged, int missing, int ranNow) {

        /** @return 0 all finished; 3 some diverged or missing; 1 every replicate diverged */
        public int exitCode() {
            if (diverged == total && total > 0) {
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

    private static final ObjectMapper MAPPER = new ObjectMapper();

    private final StudyContext context;
    private final Path directory;
    private final ReplicateExecutor executor;
    private final List<String> commandLine;
    private final PrintStream err;
    private final Progress.Mode progressMode;

    /**
     * @param context the plan, its data and trainers
     * @param directory the study directory (created when missing)
     * @param executor where replicates run
     * @param commandLine the command as typed, for the manifest
     * @param err where progress and notes go
     */
    public StudyRunner(StudyContext context, Path directory, ReplicateExecutor executor, List<String> commandLine,
            PrintStream err, Progress.Mode progressMode) {
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
            if (Files.exists(manifestFile) && !fresh) {
                refuseChanged(manifestFile, planHash, dataHash, splitHash);
            }
            if (fresh) {
                clear();
            }
            String started = Instant.now().toString();
            PlanWriter.write(plan, directory.resolve("plan.yaml"));
            if (context.minimum() != null) {
                AtomicFiles.write(directory.resolve("reference.json"), referenceJson());
            }
            List<ReplicateKey> all = context.keys();
            List<ReplicateKey> missing = new ArrayList<>();
            for (ReplicateKey key : all) {
                Path file = directory.resolve(ReplicateFile.relativePath(key));
                AtomicFiles.removeLeftovers(file.getParent());
                if (!Files.exists(file)) {
                    missing.add(key);
                }
            }
            writeManifest(started, null, planHash, dataHash, splitHash);
            Progress progress = new Progress(err, progressMode, all.size(), all.size() - missing.size());
            ReplicateWork work = new LocalWork(context);
            AtomicInteger written = new AtomicInteger(all.size() - missing.size());
            // Ctrl-C (or any signal that lets the JVM run its hooks): every replicate file is whole, since each
            // is renamed into place; say what is kept and how to go on. The JVM then exits with 130.
            Thread onInterrupt = new Thread(() -> {
                err.println();
                err.println("settle: interrupted; " + written.get() + " of " + all.size()
                        + " replicates are written and kept in " + directory + "; run the same command again to train the rest");
                err.flush();
            }, "settle-interrupt-note");
            Runtime.getRuntime().addShutdownHook(onInterrupt);
            try {
                executor.runAll(missing, work, outcome -> {
                    AtomicFiles.write(directory.resolve(ReplicateFile.relativePath(outcome.key())), outcome.file());
                    written.incrementAndGet();
                    progress.finished(outcome);
                });
            } finally {
                try {
                    Runtime.getRuntime().removeShutdownHook(onInterrupt);
                } catch (IllegalStateException shuttingDown) {
                    // the hook is running or has run: nothing to undo
                }
                progress.close();
            }
            EpochsTable.write(directory, plan, all);
            Outcome outcome = writeManifest(started, Instant.now().toString(), planHash, dataHash, splitHash);
            writeReport();
            return new Outcome(directory, outcome.total(), outcome.finished(), outcome.diverged(), outcome.missing(),
                    missing.size());
        }
    }

    /** Builds report.html and summary.csv from the finished study directory; a failure is a warning. */
    private void writeReport() {
        try {
            Report.write(directory);
        } catch (IOException | IllegalArgumentException e) {
            err.println("warning: the report was not written: " + e.getMessage()
                    + " (rebuild it with settle report " + directory + ")");
        }
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
        ArmPlan arm = context.plan().arms().get(key.arm() - 1);
        byte[] file = ReplicateFile.toJson(key, arm.name(), context.model().classes(), result, context.predict(result));
        return new ReplicateOutcome(key, file, result.diverged(), result.rates().length);
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
                "plan.yaml", "progress.json")) {
            Files.deleteIfExists(directory.resolve(name));
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
                Json.number(g, "stability_bound", c.stabilityBound());
            }
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
        return new Outcome(directory, keys.size(), finished, diverged, missingCount, 0);
    }
}
