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
import java.util.HashMap;
import java.util.List;
import java.util.Locale;
import java.util.Map;
import java.util.Optional;
import java.util.concurrent.atomic.AtomicInteger;
import settle.datasets.Standardiser;
import settle.engine.minimum.Curvature;
import settle.engine.minimum.Minimum;
import settle.engine.schedule.NudgeLog;
import settle.engine.train.ReplicateSeeds;
import settle.experiments.manual.LockstepRunner;
import settle.experiments.manual.ManualArms;
import settle.experiments.manual.NudgeQueue;
import settle.experiments.manual.NudgeRequest;
import settle.experiments.manual.ProgressBoard;
import settle.experiments.plan.Plan;
import settle.experiments.plan.PlanData;
import settle.experiments.plan.PlanWriter;
import settle.experiments.plan.SharedSettings;
import settle.experiments.run.LocalExecutor;
import settle.experiments.run.Progress;
import settle.experiments.run.ReplicateExecutor;
import settle.experiments.run.ReplicateKey;
import settle.experiments.run.ReplicateOutcome;
import settle.experiments.run.ReplicateWork;
import settle.engine.train.ArmGroup;
import settle.engine.train.Trainer;
import settle.engine.train.TrainingSettings;
import settle.input.BadInputException;
import settle.reports.Report;
import settle.reports.format.AtomicFile;
import settle.reports.format.EncodingJson;
import settle.reports.format.EncodingRecord;
import settle.reports.format.Bound;
import settle.reports.format.EpochsCsv;
import settle.reports.format.Grid;
import settle.reports.format.Manifest;
import settle.reports.format.ManifestJson;
import settle.reports.format.NudgeRecord;
import settle.reports.format.NudgesCsv;
import settle.reports.format.Reference;
import settle.reports.format.ReferenceJson;
import settle.reports.format.Replicate;
import settle.reports.format.ReplicateJson;
import settle.reports.format.StudyFormat;

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

    /** Reads progress.json, the live state an earlier run of manual arms left. */
    private static final ObjectMapper MAPPER = new ObjectMapper();

    private final StudyContext context;
    private final Path directory;
    private final ReplicateExecutor executor;
    private final List<String> commandLine;
    private final PrintStream err;
    private final java.io.PrintWriter notes;
    private final Progress.Mode progressMode;
    private final long paceMillis;
    /** The grid structure the manifest records: the plan's, or the one an earlier run of this study recorded. */
    private List<Grid> grids = List.of();
    /** Whether arms that share their mini-batches train together ({@link #armsTogether}). */
    private boolean armsTogether = true;
    /** Each replicate's status while the run goes on (null: no file yet), in {@link StudyContext#keys()} order. */
    private final String[] status;
    /** Each replicate's rows of epochs.csv (null: no file yet), in the same order. */
    private final String[] epochRows;
    private EncodingRecord encoding;

    /**
     * @param context the plan, its data and trainers
     * @param directory the study directory (created when missing)
     * @param executor where replicates run
     * @param commandLine the command as typed, for the manifest
     * @param err where the progress display and the note on an interrupt go
     * @param notes where the lines for the user go (a replicate file set aside, an unreadable progress file)
     * @param progressMode how progress is shown
     * @param paceMillis manual arms: the least time between two epoch ends, so that a person can follow and
     *     nudge a short study (0: as fast as they train); results do not depend on it
     */
    public StudyRunner(StudyContext context, Path directory, ReplicateExecutor executor, List<String> commandLine,
            PrintStream err, java.io.PrintWriter notes, Progress.Mode progressMode, long paceMillis) {
        this.notes = notes;
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
        int count = context.keys().size();
        this.status = new String[count];
        this.epochRows = new String[count];
    }

    /**
     * @param value true (the default) to train the arms of a replicate that share their mini-batches together, false
     *     to train every arm's replicate on its own; the files are the same bytes either way
     * @return this runner
     */
    public StudyRunner armsTogether(boolean value) {
        this.armsTogether = value;
        return this;
    }

    /**
     * Runs the study.
     *
     * @param fresh discard an existing study's results first
     * @throws BadInputException when the plan or data differ from the existing study's and not fresh, or the
     *     directory is in an older format; nothing is then written, and a directory this run created is removed
     * @throws StudyLock.LockHeldException when another live run holds the directory
     */
    public Outcome run(boolean fresh) throws Exception {
        Plan plan = context.plan();
        String planHash = PlanWriter.sha256(plan);
        String dataHash = Hashes.of(context.data().all());
        String splitHash = splitHash(context.data());
        String settingsHash = PlanWriter.settingsSha256(plan);
        if (Files.exists(directory) && !Files.isDirectory(directory)) {
            throw BadInputException.inFile(directory.toString(), "--out", "a file, not a directory; expected the study"
                    + " directory (it is made if missing)");
        }
        boolean existed = Files.exists(directory);
        try (StudyLock lock = StudyLock.acquire(directory)) {
            try {
                prepare(fresh, planHash, dataHash, splitHash, settingsHash);
            } catch (BadInputException e) {
                lock.close();
                if (!existed) {
                    removeCreated();
                }
                throw e;
            }
            List<Integer> manualArms = ManualArms.indices(plan);
            String started = Instant.now().toString();
            PlanWriter.write(plan, directory.resolve(StudyFormat.PLAN));
            AtomicFile.write(directory.resolve(StudyFormat.ENCODING), EncodingJson.write(encoding()));
            if (context.minimum() != null) {
                AtomicFile.write(directory.resolve(StudyFormat.REFERENCE), ReferenceJson.write(reference()));
            }
            Map<Integer, Integer> resume = resumeEpochs(manualArms);
            List<NudgeRecord> logged = replayLoggedNudges();
            List<ReplicateKey> all = context.keys();
            List<ReplicateKey> missing = new ArrayList<>();
            List<ReplicateKey> manualMissing = new ArrayList<>();
            ProgressBoard board = new ProgressBoard(directory, plan);
            int[] present = new int[plan.arms().size() + 1];
            int[] presentDiverged = new int[plan.arms().size() + 1];
            AtomicFile.removeLeftovers(directory);
            for (int a = 1; a <= plan.arms().size(); a++) {
                AtomicFile.removeLeftovers(StudyFormat.armDirectory(directory, context.armId(a)));
            }
            // every file an earlier run left is read and checked once; files are independent, so in parallel, each
            // into its own slot; a file that fails is then set aside in key order, so the notes come in a fixed order
            String[] invalid = new String[all.size()];
            java.util.stream.IntStream.range(0, all.size()).parallel().forEach(i -> invalid[i] = check(all.get(i)));
            for (int i = 0; i < all.size(); i++) {
                ReplicateKey key = all.get(i);
                if (invalid[i] != null) {
                    setAside(key, invalid[i]);
                }
                if (status[i] == null) {
                    (plan.arms().get(key.arm() - 1).manual() ? manualMissing : missing).add(key);
                } else {
                    present[key.arm()]++;
                    if (status[i].equals(Replicate.DIVERGED)) {
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
            writeManifest(started, null, planHash, dataHash, splitHash, settingsHash);
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
                ReplicateKey key = outcome.key();
                ReplicateJson.writeFiles(StudyFormat.replicateFile(directory, context.armId(key.arm()),
                        key.replicate()), outcome.file());
                int i = index(key);
                synchronized (status) {
                    status[i] = outcome.diverged() ? Replicate.DIVERGED : Replicate.FINISHED;
                    epochRows[i] = outcome.epochRows();
                }
                written.incrementAndGet();
                progress.finished(outcome);
                board.replicateWritten(key.arm(), outcome.diverged());
                board.write();
            };
            try {
                new LockstepRunner(context, directory, board, executor.parallelism(), paceMillis, logged, resume)
                        .run(manualMissing, sink::accept);
                executor.runAll(units(context, missing, armsTogether), work, sink);
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
            List<String> rows = new ArrayList<>();
            for (String r : epochRows) {
                if (r != null) {
                    rows.add(r);
                }
            }
            EpochsCsv.write(directory, rows);
            Outcome outcome = writeManifest(started, Instant.now().toString(), planHash, dataHash, splitHash,
                    settingsHash);
            ReportWritten report = writeReport();
            return new Outcome(directory, outcome.total(), outcome.finished(), outcome.diverged(), outcome.missing(),
                    missing.size(), report.problem(), report.outcome());
        }
    }

    /**
     * Everything that may refuse the run, before anything is written: an older or unreadable manifest, shared settings
     * or data that changed under the study (unless fresh), manual arms on a cluster; then, when fresh, discards the
     * results, and otherwise puts the arm directories in order for this plan ({@link #arrangeArms}).
     */
    private void prepare(boolean fresh, String planHash, String dataHash, String splitHash, String settingsHash)
            throws IOException {
        Path manifestFile = directory.resolve(StudyFormat.MANIFEST);
        grids = context.parsed().grids();
        if (Files.exists(manifestFile) && !fresh) {
            ManifestJson.Earlier earlier = ManifestJson.earlier(Files.readAllBytes(manifestFile),
                    manifestFile.toString(), rerun());
            Path encodingFile = directory.resolve(StudyFormat.ENCODING);
            if (Files.isRegularFile(encodingFile)) {
                EncodingRecord recorded;
                try {
                    recorded = EncodingJson.read(Files.readAllBytes(encodingFile), encodingFile.toString());
                } catch (BadInputException e) {
                    throw StudyFormat.damagedEncoding(directory, e);
                }
                boolean unchanged = settingsHash.equals(earlier.settingsSha256())
                        && dataHash.equals(earlier.dataSha256()) && splitHash.equals(earlier.splitSha256());
                EncodingFile.refuseChanged(directory, recorded, encoding(), unchanged);
            }
            refuseChanged(earlier, dataHash, splitHash, settingsHash);
            // a grid recorded by an earlier run is kept only for the same arms (its members are arm indices)
            if (grids.isEmpty() && planHash.equals(earlier.planSha256()) && fitsThisPlan(earlier.grids())) {
                grids = earlier.grids();
            }
        }
        List<Integer> manualArms = ManualArms.indices(context.plan());
        if (!manualArms.isEmpty() && !(executor instanceof LocalExecutor)) {
            ManualArms.refuseUnlessLocal(context.plan(), executor.describe());
        }
        if (fresh) {
            clear();
        } else {
            // a damaged nudges.csv is refused here, before the run writes or moves anything
            NudgesCsv.read(directory);
            arrangeArms();
        }
    }

    /**
     * Puts the arm directories in order for this plan: the directory of an arm no longer in the plan moves from
     * {@code arms/} to {@code retired/} (kept, never deleted), and that of an arm of the plan which is in
     * {@code retired/} moves back, so its replicates are used again. Lists directories by name only: nothing is
     * opened or read.
     */
    private void arrangeArms() throws IOException {
        java.util.Set<String> ids = new java.util.LinkedHashSet<>();
        for (int a = 1; a <= context.plan().arms().size(); a++) {
            ids.add(context.armId(a));
        }
        Path arms = directory.resolve(StudyFormat.ARMS);
        Path retired = directory.resolve(StudyFormat.RETIRED);
        for (String name : names(arms)) {
            if (!ids.contains(name)) {
                Files.createDirectories(retired);
                Path to = retired.resolve(name);
                for (int n = 2; Files.exists(to); n++) {
                    to = retired.resolve(name + "." + n);
                }
                Files.move(arms.resolve(name), to, java.nio.file.StandardCopyOption.ATOMIC_MOVE);
                notes.println("settle run: " + StudyFormat.ARMS + "/" + name + " is not an arm of this plan: moved to "
                        + StudyFormat.RETIRED + "/" + to.getFileName() + " (kept; an arm put back is moved back)");
            }
        }
        List<String> back = names(retired);
        for (String id : ids) {
            if (back.contains(id) && !Files.exists(arms.resolve(id))) {
                Files.createDirectories(arms);
                Files.move(retired.resolve(id), arms.resolve(id), java.nio.file.StandardCopyOption.ATOMIC_MOVE);
                notes.println("settle run: " + StudyFormat.RETIRED + "/" + id + " is an arm of this plan again: moved"
                        + " back to " + StudyFormat.ARMS + "/" + id + ", its replicates kept");
            }
        }
        notes.flush();
    }

    /** @return the names in {@code dir} (none when it does not exist), sorted; by name only, nothing is read */
    private static List<String> names(Path dir) throws IOException {
        if (!Files.isDirectory(dir)) {
            return List.of();
        }
        try (var entries = Files.list(dir)) {
            return entries.map(p -> p.getFileName().toString()).sorted().toList();
        }
    }

    /** @return true when every arm a recorded grid names is an arm of this plan */
    private boolean fitsThisPlan(List<Grid> recorded) {
        for (Grid g : recorded) {
            for (Grid.Member m : g.members()) {
                if (m.arm() >= context.plan().arms().size()) {
                    return false;
                }
            }
        }
        return true;
    }

    /** Removes what acquiring the lock created in a directory that did not exist before this run. */
    private void removeCreated() throws IOException {
        Files.deleteIfExists(directory.resolve(StudyFormat.LOCK));
        try (var entries = Files.list(directory)) {
            if (entries.findAny().isPresent()) {
                return;
            }
        }
        Files.deleteIfExists(directory);
    }

    /** @return the position of {@code key} in {@link StudyContext#keys()} */
    private int index(ReplicateKey key) {
        return (key.arm() - 1) * context.plan().replicates() + key.replicate() - 1;
    }

    /**
     * Checks the replicate file an earlier run wrote for {@code key}: kept when it is this replicate's file, in this
     * format, every field checked (its status and epochs.csv rows are then held in memory); one that is unreadable or
     * invalid (cut short, NUL bytes, empty, another replicate's, a field missing, of another type or out of range,
     * another format) is to be set aside and trained again.
     *
     * @return null when the file is kept or there is none; else one line saying what is wrong with it
     */
    private String check(ReplicateKey key) {
        String id = context.armId(key.arm());
        Path file = StudyFormat.replicateFile(directory, id, key.replicate());
        if (!Files.exists(file)) {
            return null;
        }
        Plan plan = context.plan();
        ReplicateJson.Expected expected = new ReplicateJson.Expected(id, plan.arms().get(key.arm() - 1).name(),
                key.replicate(), plan.seed(), seeds(key.replicate()), context.model().parameterCount(),
                context.model().classes(), context.data().test().rows(), context.shape().updatesPerEpoch(),
                context.shape().totalUpdates(), context.minimum() != null);
        try {
            Replicate r = ReplicateJson.readFiles(file, expected);
            int i = index(key);
            status[i] = r.status();
            epochRows[i] = EpochsCsv.rows(key.arm(), r.armName(), r.replicate(), r.epochs());
            return null;
        } catch (BadInputException e) {
            return e.getMessage();
        } catch (IOException e) {
            return file + ": cannot be read (" + e.getMessage() + ")";
        }
    }

    /** Moves the invalid replicate file of {@code key} aside (never deleting it) and says so on stderr. */
    private void setAside(ReplicateKey key, String why) throws IOException {
        String id = context.armId(key.arm());
        Path aside = StudyFormat.quarantine(StudyFormat.replicateFile(directory, id, key.replicate()));
        Path binary = StudyFormat.binaryFile(directory, id, key.replicate());
        String alsoBinary = "";
        if (Files.exists(binary)) {
            alsoBinary = " (with " + StudyFormat.quarantine(binary).getFileName() + ")";
        }
        notes.println("settle run: " + why + "; moved aside to " + aside.getFileName() + alsoBinary
                + " and trained again");
        notes.flush();
    }

    /** @return replicate {@code k}'s derived seeds as its file records them */
    private Replicate.Seeds seeds(int k) {
        ReplicateSeeds s = context.seeds(k);
        return new Replicate.Seeds(s.algorithm(), s.rootSeed(), s.initialisationSeed(), s.samplingSeed());
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
        } catch (IOException e) {
            String why = e.getMessage() == null ? e.toString() : e.getMessage();
            return new ReportWritten(null, "the report was not written: " + why.replace('\n', ' ') + "; " + rebuild);
        }
    }

    /** The report a run wrote, or null, and one line on what went wrong ("" when nothing did). */
    private record ReportWritten(Report.Outcome outcome, String problem) {
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

    /** Trains units of work in this JVM from a shared context. */
    private static final class LocalWork implements ReplicateWork {
        private final transient StudyContext context;

        LocalWork(StudyContext context) {
            this.context = context;
        }

        @Override
        public void run(List<ReplicateKey> unit, java.util.function.Consumer<ReplicateOutcome> each) {
            outcomes(context, unit, each);
        }
    }

    /** @return the finished replicate {@code key} of {@code context}, as its file's bytes */
    public static ReplicateOutcome outcome(StudyContext context, ReplicateKey key) {
        return ReplicateFile.outcome(context, key, context.train(key));
    }

    /** @return this run's encoding.json: how the data's columns became the inputs, and the test labels */
    private EncodingRecord encoding() {
        if (encoding == null) {
            encoding = EncodingFile.of(context.plan().data().source(), context.data());
        }
        return encoding;
    }

    /**
     * Trains one unit: replicate k of its arms, together when there are several ({@link ArmGroup}; every file is
     * the same bytes as the arm's replicate trained alone).
     *
     * @param unit keys of one replicate whose arms share their mini-batches ({@link #units})
     * @param each receives each replicate's outcome as soon as that arm is done
     */
    public static void outcomes(StudyContext context, List<ReplicateKey> unit,
            java.util.function.Consumer<ReplicateOutcome> each) {
        if (unit.size() == 1) {
            each.accept(outcome(context, unit.get(0)));
            return;
        }
        int replicate = unit.get(0).replicate();
        List<Trainer> trainers = new ArrayList<>();
        List<java.util.function.Consumer<settle.engine.train.EpochRecord>> listeners = new ArrayList<>();
        for (ReplicateKey key : unit) {
            if (key.replicate() != replicate) {
                throw new IllegalArgumentException("a unit of work is one replicate: " + unit);
            }
            trainers.add(context.trainer(key.arm()));
            listeners.add(record -> { });
        }
        ArmGroup.of(trainers).run(context.seeds(replicate), listeners,
                (i, result) -> each.accept(ReplicateFile.outcome(context, unit.get(i), result)));
    }

    /**
     * Cuts the keys to train into units of work: with {@code together}, the keys of one replicate whose arms share
     * their mini-batches ({@link ArmGroup#shareBatches}) form one unit; otherwise every key is a unit of its own.
     * Units come replicate by replicate, each in arm order.
     */
    public static List<List<ReplicateKey>> units(StudyContext context, List<ReplicateKey> keys, boolean together) {
        java.util.TreeMap<Integer, List<List<ReplicateKey>>> byReplicate = new java.util.TreeMap<>();
        List<ReplicateKey> sorted = new ArrayList<>(keys);
        sorted.sort(null);
        for (ReplicateKey key : sorted) {
            List<List<ReplicateKey>> units = byReplicate.computeIfAbsent(key.replicate(), r -> new ArrayList<>());
            List<ReplicateKey> home = null;
            if (together) {
                Trainer mine = context.trainer(key.arm());
                for (List<ReplicateKey> unit : units) {
                    if (ArmGroup.shareBatches(context.trainer(unit.get(0).arm()), mine)) {
                        home = unit;
                        break;
                    }
                }
            }
            if (home == null) {
                home = new ArrayList<>();
                units.add(home);
            }
            home.add(key);
        }
        List<List<ReplicateKey>> all = new ArrayList<>();
        for (List<List<ReplicateKey>> units : byReplicate.values()) {
            all.addAll(units);
        }
        return all;
    }

    /**
     * Refuses a study whose shared settings (seed, data and its encoding, model, training), data or split changed:
     * one line naming every shared key that changed with its new and old values, and what to do. Arms, the replicate
     * count, the baseline and the study's name may change: the study grows.
     */
    private void refuseChanged(ManifestJson.Earlier old, String dataHash, String splitHash, String settingsHash) {
        List<String> changed = new ArrayList<>();
        if (!settingsHash.equals(old.settingsSha256())) {
            Path planFile = directory.resolve(StudyFormat.PLAN);
            try {
                changed.addAll(SharedSettings.changes(Files.readString(planFile), context.plan()));
            } catch (IOException e) {
                // no key by key: the study's plan.yaml cannot say which
            }
            if (changed.isEmpty()) {
                changed.add("the shared settings (seed, data, model, training; " + planFile.getFileName()
                        + " cannot say which)");
            }
        }
        if (!dataHash.equals(old.dataSha256())) {
            changed.add("the data (its SHA-256)");
        }
        if (!splitHash.equals(old.splitSha256()) && changed.isEmpty()) {
            changed.add("the split (its SHA-256)");
        }
        if (!changed.isEmpty()) {
            throw BadInputException.inFile(directory.toString(), "", "changed since this study was run: "
                    + String.join(", ", changed) + "; a study grows (arms, replicates) only while its seed, data, model"
                    + " and training stay the same: use --fresh to discard its results, or --out DIR for a new study");
        }
    }

    private void clear() throws IOException {
        for (Path arms : List.of(directory.resolve(StudyFormat.ARMS), directory.resolve(StudyFormat.RETIRED))) {
            if (!Files.exists(arms)) {
                continue;
            }
            try (var walk = Files.walk(arms)) {
                List<Path> paths = walk.sorted((a, b) -> b.getNameCount() - a.getNameCount()).toList();
                for (Path p : paths) {
                    Files.deleteIfExists(p);
                }
            }
        }
        for (String name : List.of(StudyFormat.MANIFEST, StudyFormat.REFERENCE, StudyFormat.ENCODING,
                StudyFormat.EPOCHS, StudyFormat.SUMMARY, StudyFormat.REPORT, StudyFormat.PLAN, StudyFormat.PROGRESS,
                StudyFormat.NUDGES, StudyFormat.REPLAY)) {
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
     * logs, so the replicates still to train replay them. A nudge is the arm's of that name (the arm may stand
     * elsewhere in a plan that grew); one of an arm that is not a manual arm of this plan (removed from the plan, its
     * directory retired) is not replayed but stays in {@code nudges.csv}, for when the arm is put back.
     */
    private List<NudgeRecord> replayLoggedNudges() throws IOException {
        List<NudgeRecord> logged = NudgesCsv.read(directory);
        Plan plan = context.plan();
        for (int a = 1; a <= plan.arms().size(); a++) {
            if (context.nudgeLog(a) != null) {
                context.nudgeLog(a).replaceAll(plan.arms().get(a - 1).nudges());
            }
        }
        for (NudgeRecord n : logged) {
            int a = LockstepRunner.armIndex(plan, n.arm());
            if (a >= 1 && plan.arms().get(a - 1).manual()) {
                context.nudgeLog(a).append(new NudgeLog.Entry(n.fromEpoch(), n.factor(), n.note()));
            }
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
                int index = LockstepRunner.armIndex(context.plan(), arm.path("name").asText());
                if (manualArms.contains(index)) {
                    out.put(index, arm.path("epoch").asInt(0) + 1);
                }
            }
        } catch (IOException e) {
            notes.println("settle: note: " + file + " is unreadable (" + e.getMessage() + "); waiting nudges apply"
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

    /** @return θ*, its curvature and the a-priori bound, as reference.json records them */
    private Reference reference() {
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
        Bound bound = AprioriBound.of(plan, context.model(), context.data().train(), m.theta(), rates).record(names);
        String model = context.model().describe();
        String method = m.method().name().toLowerCase(Locale.ROOT);
        if (c == null) {
            return new Reference(model, method, m.iterations(), m.converged(), m.objective(), m.gradientNorm(),
                    m.theta(), -1, null, Double.NaN, Double.NaN, Double.NaN, skip.orElse(""), bound);
        }
        return new Reference(model, method, m.iterations(), m.converged(), m.objective(), m.gradientNorm(), m.theta(),
                c.gaugeDimension(), c.eigenvalues(), c.lambdaMin(), c.lambdaMax(),
                c.stabilityBound(plan.training().momentum()), null, bound);
    }

    /** Writes the manifest, with each replicate's status as held in memory. */
    private Outcome writeManifest(String started, String ended, String planHash, String dataHash, String splitHash,
            String settingsHash) throws IOException {
        Plan plan = context.plan();
        PlanData data = context.data();
        List<ReplicateKey> keys = context.keys();
        List<Manifest.Status> statuses = new ArrayList<>();
        int finished = 0;
        int diverged = 0;
        int missingCount = 0;
        synchronized (status) {
            for (int i = 0; i < keys.size(); i++) {
                String s = status[i];
                if (s == null) {
                    s = ended == null ? Manifest.PENDING : Manifest.MISSING;
                    missingCount++;
                } else if (s.equals(Replicate.DIVERGED)) {
                    diverged++;
                } else {
                    finished++;
                }
                statuses.add(new Manifest.Status(keys.get(i).arm(), keys.get(i).replicate(), s));
            }
        }
        Standardiser st = data.standardiser();
        List<String> arms = new ArrayList<>();
        List<String> armIds = new ArrayList<>();
        for (int a = 1; a <= plan.arms().size(); a++) {
            arms.add(plan.arms().get(a - 1).name());
            armIds.add(context.armId(a));
        }
        Manifest manifest = new Manifest(StudyFormat.VERSION, plan.study(),
                new Manifest.Tool("settle", Provenance.version(), Provenance.gitCommit()),
                new Manifest.Jvm(System.getProperty("java.vm.vendor", ""), System.getProperty("java.vm.name", ""),
                        System.getProperty("java.runtime.version", System.getProperty("java.version", ""))),
                new Manifest.Cpu(Provenance.cpuModel(), System.getProperty("os.arch", ""),
                        Runtime.getRuntime().availableProcessors()),
                executor.describe(), executor.parallelism(), commandLine, ReplicateSeeds.ALGORITHM, plan.seed(),
                started, ended, planHash, dataHash, splitHash, settingsHash,
                new Manifest.Data(plan.data().source(), data.all().rows(), data.all().features(),
                        data.all().featureNames(), data.all().classNames(), data.train().rows(), data.test().rows(),
                        data.holdout() == null ? 0 : data.holdout().rows(),
                        data.updatesPerEpoch(plan.training().batch())),
                st == null ? null : new Manifest.Standardisation(st.means(), st.scales()),
                context.model().describe(), context.model().parameterCount(), plan.model().l2(),
                training(plan.training()), context.minimum() == null ? "none: the model is not convex" : StudyFormat.REFERENCE, plan.baseline(),
                arms, armIds, grids, statuses);
        AtomicFile.write(directory.resolve(StudyFormat.MANIFEST), ManifestJson.write(manifest));
        return new Outcome(directory, keys.size(), finished, diverged, missingCount, 0, "", null);
    }

    /** @return the plan's training settings as the manifest records them */
    static Manifest.Training training(TrainingSettings t) {
        return new Manifest.Training(t.epochs(), t.batch(), t.sampling().key(), t.momentum(), t.tail(), t.snapshots());
    }
}
