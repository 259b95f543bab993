package settle.experiments.manual;

import java.io.IOException;
import java.nio.file.Path;
import java.time.Instant;
import java.util.ArrayList;
import java.util.HashSet;
import java.util.LinkedHashMap;
import java.util.List;
import java.util.Map;
import java.util.Set;
import java.util.concurrent.CancellationException;
import java.util.concurrent.Phaser;
import java.util.concurrent.Semaphore;
import java.util.concurrent.atomic.AtomicReference;
import settle.engine.schedule.NudgeLog;
import settle.engine.schedule.RunShape;
import settle.engine.schedule.Schedule;
import settle.engine.train.EpochRecord;
import settle.engine.train.ReplicateResult;
import settle.experiments.plan.ArmPlan;
import settle.experiments.plan.Plan;
import settle.experiments.run.ReplicateKey;
import settle.experiments.run.ReplicateOutcome;
import settle.experiments.study.ReplicateFile;
import settle.experiments.study.StudyContext;
import settle.reports.format.NudgeRecord;
import settle.reports.format.NudgesCsv;

/**
 * Trains the replicates of manual arms in step: every replicate of an arm has its own thread, and each
 * waits at the end of every epoch until the arm's other replicates have finished that epoch too (a barrier
 * per arm). The last to arrive records the epoch on the {@link ProgressBoard}, waits out the pace, applies
 * the nudges waiting in the {@link NudgeQueue} for that arm (from the next epoch on, recorded in
 * {@code nudges.csv} and {@code replay.yaml}), and releases the others. So every replicate of the arm sees
 * the same rate at the same epoch, and a nudge is in force from the same epoch for all of them.
 *
 * <p>At most {@code parallelism} replicates train at once (a replicate waiting at a barrier gives its turn
 * away). A replicate that diverges leaves the barrier; the others go on. Results do not depend on the
 * thread count or the timing: the replicates read the nudge log only between epochs, and the log changes only
 * while every replicate of the arm waits.
 */
public final class LockstepRunner {

    /** Receives finished replicates, one at a time. */
    @FunctionalInterface
    public interface Sink {
        void accept(ReplicateOutcome outcome) throws Exception;
    }

    private final StudyContext context;
    private final Path directory;
    private final ProgressBoard board;
    private final Semaphore permits;
    private final long paceNanos;
    private final List<NudgeRecord> applied;
    private final Set<String> appliedIds = new HashSet<>();
    private final Map<Integer, Integer> resumeEpochs;
    private final AtomicReference<Throwable> failure = new AtomicReference<>();
    private final Map<Integer, ArmRun> live = new LinkedHashMap<>();
    private final Object desk = new Object();
    private final Object sinkLock = new Object();

    /**
     * @param board where epoch ends are shown
     * @param parallelism replicates trained at once, ≥ 1
     * @param paceMillis the least time between two epoch ends of an arm (0: as fast as it trains)
     * @param applied every nudge in {@code nudges.csv}, already in the context's nudge logs; appended to
     * @param resumeEpochs per manual arm, the first epoch whose end may apply a waiting request (a resumed run
     *     applies requests no earlier than where the run it resumes had reached)
     */
    public LockstepRunner(StudyContext context, Path directory, ProgressBoard board, int parallelism, long paceMillis,
            List<NudgeRecord> applied, Map<Integer, Integer> resumeEpochs) {
        if (parallelism < 1) {
            throw new IllegalArgumentException("parallelism must be at least 1: " + parallelism);
        }
        this.context = context;
        this.directory = directory;
        this.board = board;
        this.permits = new Semaphore(parallelism);
        this.paceNanos = Math.max(0, paceMillis) * 1_000_000L;
        this.applied = applied;
        for (NudgeRecord n : applied) {
            appliedIds.add(n.request());
        }
        this.resumeEpochs = Map.copyOf(resumeEpochs);
    }

    /** One manual arm's barrier: a party per replicate still training. */
    private final class ArmRun extends Phaser {
        final int arm;
        final List<ReplicateKey> keys;
        final EpochRecord[] latest;
        long lastEnd = System.nanoTime();
        volatile boolean done;

        ArmRun(int arm, List<ReplicateKey> keys) {
            super(keys.size());
            this.arm = arm;
            this.keys = keys;
            this.latest = new EpochRecord[keys.size()];
        }

        @Override
        protected boolean onAdvance(int phase, int registeredParties) {
            if (registeredParties == 0) {
                done = true;
                return true;
            }
            try {
                epochEnded(this, phase + 1);
            } catch (Throwable t) {
                failure.compareAndSet(null, t);
            }
            return false;
        }
    }

    /** Whether a replicate's thread holds a training turn. */
    private static final class Turn {
        boolean holding;
    }

    /**
     * Trains {@code keys} (replicates of manual arms) and hands each to {@code sink} as it finishes.
     *
     * @throws InterruptedException when interrupted; replicates in flight are abandoned
     */
    public void run(List<ReplicateKey> keys, Sink sink) throws Exception {
        if (keys.isEmpty()) {
            return;
        }
        Map<Integer, List<ReplicateKey>> byArm = new LinkedHashMap<>();
        for (ReplicateKey k : keys) {
            byArm.computeIfAbsent(k.arm(), a -> new ArrayList<>()).add(k);
        }
        List<Thread> threads = new ArrayList<>();
        synchronized (desk) {
            for (var e : byArm.entrySet()) {
                live.put(e.getKey(), new ArmRun(e.getKey(), e.getValue()));
            }
        }
        for (ArmRun run : live.values()) {
            for (int slot = 0; slot < run.keys.size(); slot++) {
                int s = slot;
                Thread t = new Thread(() -> replicate(run, s, sink), "settle-manual-" + run.arm + "-"
                        + run.keys.get(s).replicate());
                t.setDaemon(true);
                threads.add(t);
            }
        }
        for (Thread t : threads) {
            t.start();
        }
        try {
            for (Thread t : threads) {
                t.join();
            }
        } catch (InterruptedException e) {
            for (Thread t : threads) {
                t.interrupt();
            }
            throw e;
        }
        Throwable f = failure.get();
        if (f instanceof Exception ex) {
            throw ex;
        }
        if (f instanceof Error err) {
            throw err;
        }
    }

    private void replicate(ArmRun run, int slot, Sink sink) {
        ReplicateKey key = run.keys.get(slot);
        Turn turn = new Turn();
        try {
            permits.acquire();
            turn.holding = true;
            ReplicateResult result = context.trainer(key.arm()).run(context.seeds(key.replicate()), record -> {
                run.latest[slot] = record;
                permits.release();
                turn.holding = false;
                try {
                    run.awaitAdvanceInterruptibly(run.arrive());
                } catch (InterruptedException e) {
                    Thread.currentThread().interrupt();
                    throw new CancellationException("interrupted");
                }
                permits.acquireUninterruptibly();
                turn.holding = true;
                if (failure.get() != null) {
                    throw new CancellationException("stopped: another replicate failed");
                }
            });
            ReplicateOutcome outcome = ReplicateFile.outcome(context, key, result);
            synchronized (sinkLock) {
                sink.accept(outcome);
            }
        } catch (InterruptedException e) {
            Thread.currentThread().interrupt();
            failure.compareAndSet(null, e);
        } catch (CancellationException e) {
            failure.compareAndSet(null, new InterruptedException(e.getMessage()));
        } catch (Throwable t) {
            failure.compareAndSet(null, t);
        } finally {
            if (turn.holding) {
                permits.release();
            }
            run.arriveAndDeregister();
        }
    }

    /** The last replicate of an arm reached the end of {@code epoch}: record it, pace, apply nudges. */
    private void epochEnded(ArmRun run, int epoch) throws IOException, InterruptedException {
        int n = run.latest.length;
        double[] objective = new double[n];
        double[] testLoss = new double[n];
        double[] distance = new double[n];
        int count = 0;
        double rate = Double.NaN;
        for (EpochRecord r : run.latest) {
            if (r != null && r.epoch() == epoch) {
                objective[count] = r.objective();
                testLoss[count] = r.testLoss();
                distance[count] = r.distance();
                rate = r.rate();
                count++;
            }
        }
        long wait = run.lastEnd + paceNanos - System.nanoTime();
        if (wait > 0) {
            Thread.sleep(wait / 1_000_000L, (int) (wait % 1_000_000L));
        }
        run.lastEnd = System.nanoTime();
        RunShape shape = context.shape();
        NudgeLog log = context.nudgeLog(run.arm);
        double next;
        synchronized (desk) {
            if (epoch >= shape.epochs()) {
                run.done = true;
            }
            handleRequests(run, epoch);
            next = epoch < shape.epochs() ? baseRate(run.arm, epoch + 1) * log.multiplier(epoch + 1) : Double.NaN;
        }
        board.epoch(run.arm, epoch, rate, next, log.size(), ProgressBoard.Quartiles.of(objective, count),
                ProgressBoard.Quartiles.of(testLoss, count), ProgressBoard.Quartiles.of(distance, count));
        board.write();
    }

    /** Applies the requests for {@code run}'s arm from {@code epoch + 1}; refuses those no live arm can take. */
    private void handleRequests(ArmRun run, int epoch) throws IOException {
        NudgeQueue.Pending pending = NudgeQueue.pending(directory);
        for (NudgeQueue.Unreadable u : pending.unreadable()) {
            NudgeQueue.refuse(directory, u.id(), u.reason());
        }
        Plan plan = context.plan();
        for (NudgeRequest r : pending.requests()) {
            if (appliedIds.contains(r.id())) {
                NudgeQueue.remove(directory, r.id());
                continue;
            }
            int arm = armIndex(plan, r.arm());
            ArmRun target = live.get(arm);
            if (target == null || target.done) {
                NudgeQueue.refuse(directory, r.id(), refusal(plan, r.arm(), arm));
                continue;
            }
            if (target != run || epoch < resumeEpochs.getOrDefault(arm, 1)) {
                continue;
            }
            apply(r, arm, epoch + 1);
        }
    }

    private void apply(NudgeRequest r, int arm, int from) throws IOException {
        NudgeLog log = context.nudgeLog(arm);
        double base = baseRate(arm, from);
        double before = log.multiplier(from);
        double factor;
        if (r.byFactor()) {
            factor = r.factor();
        } else {
            if (!(base * before > 0)) {
                NudgeQueue.refuse(directory, r.id(), "arm '" + r.arm() + "': the base schedule's rate at the first"
                        + " update of epoch " + from + " is 0, so no factor gives rate " + r.rate() + "; use --factor");
                return;
            }
            factor = r.rate() / (base * before);
        }
        if (!(factor > 0) || factor == Double.POSITIVE_INFINITY) {
            NudgeQueue.refuse(directory, r.id(), "arm '" + r.arm() + "': " + r.describe()
                    + " gives the factor " + factor + ", which is not a positive finite number");
            return;
        }
        String note = r.note();
        log.append(new NudgeLog.Entry(from, factor, note));
        double rate = base * log.multiplier(from);
        applied.add(new NudgeRecord(arm, r.arm(), from, factor, rate, note, Instant.now().toString(), r.id()));
        appliedIds.add(r.id());
        NudgesCsv.write(directory, applied);
        List<NudgeLog> logs = new ArrayList<>();
        for (int a = 1; a <= context.plan().arms().size(); a++) {
            logs.add(context.nudgeLog(a));
        }
        ManualArms.writeReplay(directory, context.plan(), logs);
        NudgeQueue.remove(directory, r.id());
    }

    /** @return the rate of the arm's planned schedule at the first update of {@code epoch} */
    private double baseRate(int arm, int epoch) {
        RunShape shape = context.shape();
        Schedule base = context.plan().arms().get(arm - 1).schedule().schedule();
        return base.start(shape).rate(epoch, (long) (epoch - 1) * shape.updatesPerEpoch() + 1);
    }

    /** @return the 1-based index of the arm named {@code name}, or 0 */
    public static int armIndex(Plan plan, String name) {
        for (int i = 0; i < plan.arms().size(); i++) {
            if (plan.arms().get(i).name().equals(name)) {
                return i + 1;
            }
        }
        return 0;
    }

    /** @return why a request for arm {@code name} (index {@code arm}, 0 when unknown) cannot be applied */
    public static String refusal(Plan plan, String name, int arm) {
        if (arm == 0) {
            List<String> manual = new ArrayList<>();
            for (ArmPlan a : plan.arms()) {
                if (a.manual()) {
                    manual.add("'" + a.name() + "'");
                }
            }
            return "no arm named '" + name + "' in study " + plan.study() + " (manual arms: "
                    + (manual.isEmpty() ? "none" : String.join(", ", manual)) + ")";
        }
        if (!plan.arms().get(arm - 1).manual()) {
            return "arm '" + name + "' is not manual (manual: false in its plan); only manual arms take nudges";
        }
        return "arm '" + name + "' has finished: every epoch of its replicates has run, so a nudge cannot change it";
    }
}
