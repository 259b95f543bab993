package settle.benchmarks;

import java.lang.management.ManagementFactory;
import java.lang.management.MemoryPoolMXBean;
import java.lang.management.MemoryType;
import java.util.ArrayList;
import java.util.Arrays;
import java.util.List;
import java.util.Locale;
import java.util.concurrent.ExecutorService;
import java.util.concurrent.Executors;
import java.util.concurrent.Future;
import settle.datasets.Dataset;
import settle.engine.train.ReplicateResult;
import settle.engine.train.ReplicateSeeds;
import settle.engine.train.Sampling;
import settle.engine.train.Trainer;
import settle.engine.train.TrainingSettings;

/**
 * The study-level gates, measured on trainers built directly (the way the runner builds them: one immutable
 * trainer per arm, replicates on a fixed thread pool, each replicate's result reduced to a summary and dropped):
 *
 * <ul>
 *   <li>{@code threads [--workload KEY] [--replicates R] [--rounds N]}: R replicates on 1 thread, then on 2, interleaved
 *       over N rounds; prints the wall-clock speedup and checks that every replicate's final θ is bit-identical
 *       between the two;</li>
 *   <li>{@code rows [--workload KEY] [--epochs E] [--rounds N]}: 10k, 20k and 40k rows, interleaved over N rounds
 *       after 2 s of warm-up, each timing the mean of back-to-back replicates lasting at least 0.5 s (the plan's
 *       default tail: τ = 0.1, 50 snapshots; the default 5 epochs make the tail at least 50 updates long at every
 *       size, so K = 50 everywhere); prints CPU time per row × epoch;</li>
 *   <li>{@code memory [--replicates R] [--rows N] [--epochs E]}: an MLP 784-256-10 study (default 200 replicates,
 *       20 000 rows, 5 epochs, the plan's default tail) on 2 threads; run it with {@code -Xmx1g}; prints the heap in
 *       use after each replicate and the pools' peak.</li>
 * </ul>
 */
public final class Scaling {

    private Scaling() {
    }

    /** Entry point; see the class comment. */
    public static void main(String[] args) throws Exception {
        if (args.length == 0) {
            usage();
        }
        String mode = args[0];
        String workload = mode.equals("memory") ? "mlp-784-256-10-b256" : "mlp-64-128-10-b64";
        int replicates = mode.equals("memory") ? 200 : 8;
        int rounds = mode.equals("rows") ? 5 : 3;
        int rows = 20_000;
        int epochs = mode.equals("threads") ? 2 : 5;
        for (int i = 1; i < args.length; i++) {
            switch (args[i]) {
                case "--workload" -> workload = args[++i];
                case "--replicates" -> replicates = Integer.parseInt(args[++i]);
                case "--rounds" -> rounds = Integer.parseInt(args[++i]);
                case "--rows" -> rows = Integer.parseInt(args[++i]);
                case "--epochs" -> epochs = Integer.parseInt(args[++i]);
                default -> usage();
            }
        }
        System.out.printf(Locale.ROOT, "machine: %s, %d cores; %s; max heap %d MB%n", Machine.cpuModel(),
                Runtime.getRuntime().availableProcessors(), Machine.jvm(), Runtime.getRuntime().maxMemory() >> 20);
        System.out.println("settle kernels: " + settle.engine.model.Kernels.describe());
        switch (mode) {
            case "threads" -> threads(Workload.of(workload).withEpochs(epochs), replicates, rounds);
            case "rows" -> rows(Workload.of(workload).withEpochs(epochs), rounds);
            case "memory" -> memory(Workload.of(workload).withRows(rows).withEpochs(epochs), replicates);
            default -> usage();
        }
    }

    private static void usage() {
        System.err.println("usage: Scaling threads|rows|memory [--workload KEY] [--replicates R] [--rounds N] "
                + "[--rows N] [--epochs E]");
        System.exit(2);
    }

    /** A study-like trainer: a plan's default tail (τ = 0.1, 50 snapshots: plan.Defaults), shuffle, no momentum. */
    private static Trainer studyTrainer(Workload w, Dataset data) {
        TrainingSettings settings = new TrainingSettings(w.epochs(), w.batch(), Sampling.SHUFFLE, 0.0, 0.1, 50, false);
        return Trainer.builder(w.model(), data, w.schedule(), settings).build();
    }

    private static void threads(Workload w, int replicates, int rounds) throws Exception {
        Dataset data = w.data(20260101L);
        Trainer trainer = studyTrainer(w, data);
        System.out.printf(Locale.ROOT, "%s, N=%d, %d epochs, default tail; %d replicates per run%n", w.describe(),
                w.rows(), w.epochs(), replicates);
        runPool(trainer, replicates, 2, new long[replicates]); // warm-up
        double[] speedups = new double[rounds];
        double[] cpuRatios = new double[rounds];
        for (int round = 0; round < rounds; round++) {
            long[] cpu1 = new long[replicates];
            long[] cpu2 = new long[replicates];
            long start = System.nanoTime();
            long[] one = runPool(trainer, replicates, 1, cpu1);
            double t1 = (System.nanoTime() - start) * 1e-9;
            start = System.nanoTime();
            long[] two = runPool(trainer, replicates, 2, cpu2);
            double t2 = (System.nanoTime() - start) * 1e-9;
            if (!Arrays.equals(one, two)) {
                throw new IllegalStateException("results differ between 1 and 2 threads");
            }
            speedups[round] = t1 / t2;
            double c1 = Arrays.stream(cpu1).sum() * 1e-9;
            double c2 = Arrays.stream(cpu2).sum() * 1e-9;
            cpuRatios[round] = c1 / c2;
            System.out.printf(Locale.ROOT, "  round %d: 1 thread %.2f s (CPU %.2f s), 2 threads %.2f s (CPU %.2f s); "
                    + "wall-clock speedup %.2f×, CPU per replicate 1-thread/2-thread %.2f; final θ bit-identical%n",
                    round + 1, t1, c1, t2, c2, speedups[round], cpuRatios[round]);
        }
        System.out.printf(Locale.ROOT, "wall-clock speedup on 2 threads: median %s%n", PeerSpeed.spread(speedups));
        System.out.printf(Locale.ROOT, "work per replicate (CPU time, 1 thread / 2 threads): median %s "
                + "(1.00 = the threads do not slow each other; speedup = 2 × this when both cores are free)%n",
                PeerSpeed.spread(cpuRatios));
    }

    /**
     * @param cpu receives each replicate's CPU time in nanoseconds; modified
     * @return per replicate, a hash of the bits of its final θ
     */
    private static long[] runPool(Trainer trainer, int replicates, int threads, long[] cpu) throws Exception {
        ExecutorService pool = Executors.newFixedThreadPool(threads);
        try {
            List<Future<Long>> futures = new ArrayList<>();
            for (int k = 1; k <= replicates; k++) {
                int replicate = k;
                futures.add(pool.submit(() -> {
                    long before = Clock.cpuNanos();
                    long h = hash(trainer.run(ReplicateSeeds.derive(20260101L, replicate)));
                    cpu[replicate - 1] = Clock.cpuNanos() - before;
                    return h;
                }));
            }
            long[] hashes = new long[replicates];
            for (int k = 0; k < replicates; k++) {
                hashes[k] = futures.get(k).get();
            }
            return hashes;
        } finally {
            pool.shutdown();
        }
    }

    private static long hash(ReplicateResult result) {
        long h = result.status().ordinal();
        for (double v : result.last()) {
            h = 31 * h + Double.doubleToRawLongBits(v);
        }
        return h;
    }

    private static void rows(Workload w, int rounds) {
        int[] sizes = {10_000, 20_000, 40_000};
        Trainer[] trainers = new Trainer[sizes.length];
        for (int s = 0; s < sizes.length; s++) {
            trainers[s] = studyTrainer(w.withRows(sizes[s]), w.withRows(sizes[s]).data(20260101L));
        }
        System.out.printf(Locale.ROOT, "%s, %d epochs, default tail (τ = 0.1, 50 snapshots); CPU time per row × epoch%n",
                w.describe(), w.epochs());
        for (int s = 0; s < sizes.length; s++) {
            System.out.printf(Locale.ROOT, "  %6d rows: %d updates, %d snapshots%n", sizes[s],
                    trainers[s].tailPlan().totalUpdates(), trainers[s].tailPlan().snapshots());
        }
        // warm-up until the JIT has compiled the kernels (2 s of training), then each timing is the mean of
        // back-to-back replicates lasting at least 0.5 s, so that short runs are not dominated by noise
        int[] count = new int[sizes.length];
        int seed = 1;
        for (double warmed = 0; warmed < 2.0; ) {
            for (int s = 0; s < sizes.length; s++) {
                long cpu = Clock.cpuNanos();
                trainers[s].run(ReplicateSeeds.derive(20260101L, seed++));
                double seconds = (Clock.cpuNanos() - cpu) * 1e-9;
                warmed += seconds;
                count[s] = (int) Math.max(1, Math.ceil(0.5 / seconds));
            }
        }
        double[][] perRow = new double[sizes.length][rounds];
        for (int round = 0; round < rounds; round++) {
            for (int s = 0; s < sizes.length; s++) {
                long cpu = Clock.cpuNanos();
                for (int c = 0; c < count[s]; c++) {
                    trainers[s].run(ReplicateSeeds.derive(20260101L, seed++));
                }
                double seconds = (Clock.cpuNanos() - cpu) * 1e-9 / count[s];
                perRow[s][round] = seconds / ((double) sizes[s] * w.epochs());
            }
        }
        double[] medians = new double[sizes.length];
        for (int s = 0; s < sizes.length; s++) {
            medians[s] = PeerSpeed.median(perRow[s]);
            System.out.printf(Locale.ROOT, "  %6d rows: %.3f µs per row × epoch (rounds of %d replicates: %s)%n",
                    sizes[s], medians[s] * 1e6, count[s],
                    Arrays.toString(Arrays.stream(perRow[s]).map(v -> Math.round(v * 1e9) / 1e3).toArray()));
        }
        double min = Arrays.stream(medians).min().orElseThrow();
        double max = Arrays.stream(medians).max().orElseThrow();
        System.out.printf(Locale.ROOT, "largest / smallest: %.3f (gate: within 15%%)%n", max / min);
    }

    private static void memory(Workload w, int replicates) throws Exception {
        Dataset data = w.data(20260101L);
        Trainer trainer = studyTrainer(w, data);
        System.out.printf(Locale.ROOT, "%s, N=%d, %d epochs, default tail (τ = 0.1, 50 snapshots: K·P = %d > %d, "
                + "so snapshots are not stored); %d replicates on 2 threads%n", w.describe(), w.rows(), w.epochs(),
                50L * w.model().parameterCount(), Trainer.SNAPSHOT_LIMIT, replicates);
        ExecutorService pool = Executors.newFixedThreadPool(2);
        long start = System.nanoTime();
        try {
            List<Future<double[]>> futures = new ArrayList<>();
            for (int k = 1; k <= replicates; k++) {
                int replicate = k;
                futures.add(pool.submit(() -> {
                    ReplicateResult r = trainer.run(ReplicateSeeds.derive(20260101L, replicate));
                    // what a runner keeps after writing the replicate's rows: a few numbers
                    return new double[] {r.status().ordinal(), r.wander() == null ? Double.NaN : r.wander().tailRadius()};
                }));
            }
            for (int k = 0; k < replicates; k++) {
                double[] summary = futures.get(k).get();
                Runtime rt = Runtime.getRuntime();
                System.out.printf(Locale.ROOT, "  replicate %d: %s, tail radius %.4g; heap in use %d MB; %.0f s%n", k + 1,
                        summary[0] == 0 ? "finished" : "diverged", summary[1], (rt.totalMemory() - rt.freeMemory()) >> 20,
                        (System.nanoTime() - start) * 1e-9);
            }
        } finally {
            pool.shutdown();
        }
        long peak = 0;
        for (MemoryPoolMXBean pool2 : ManagementFactory.getMemoryPoolMXBeans()) {
            if (pool2.getType() == MemoryType.HEAP) {
                peak += pool2.getPeakUsage().getUsed();
            }
        }
        System.out.printf(Locale.ROOT, "done: %d replicates in %.0f s; heap pools' peak use %d MB of %d MB%n", replicates,
                (System.nanoTime() - start) * 1e-9, peak >> 20, Runtime.getRuntime().maxMemory() >> 20);
    }
}
