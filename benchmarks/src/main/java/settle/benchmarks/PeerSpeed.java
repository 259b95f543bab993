package settle.benchmarks;

import java.io.BufferedReader;
import java.io.IOException;
import java.io.InputStreamReader;
import java.io.OutputStreamWriter;
import java.io.PrintWriter;
import java.nio.charset.StandardCharsets;
import java.nio.file.Files;
import java.nio.file.Path;
import java.time.LocalDate;
import java.util.ArrayList;
import java.util.Arrays;
import java.util.List;
import java.util.Locale;
import settle.datasets.Dataset;
import settle.engine.model.FullBatch;
import settle.engine.model.Kernels;
import settle.engine.train.ReplicateResult;
import settle.engine.train.ReplicateSeeds;
import settle.engine.train.Trainer;

/**
 * End-to-end speed comparison: each {@link Workload} trained by settle's {@link Trainer} in this JVM and by the
 * PyTorch peer ({@code peer.py}, idiomatic and hand-written variants) in one persistent python process pinned to
 * one thread, interleaved settle, idiomatic, hand, settle, … over several rounds after discarded warm-up rounds
 * (until settle has trained {@link #WARM_UP_SECONDS} s). Each timing is the mean of back-to-back replicates
 * lasting at least {@link #TIMING_SECONDS} s. Prints per workload the examples/s of each side, the settle/peer
 * ratios (median and min–max over rounds) and settle's GFLOP/s of needed work against the measured peak.
 *
 * <p>Usage: {@code java --add-modules jdk.incubator.vector -cp benchmarks.jar settle.benchmarks.PeerSpeed
 * [--rounds R] [--peer PATH/peer.py] [--python /usr/bin/python3] [--only KEY,KEY]}.
 */
public final class PeerSpeed {

    private PeerSpeed() {
    }

    /** Runs the comparison; see the class comment for the options. */
    public static void main(String[] args) throws Exception {
        int rounds = 5;
        String peer = "benchmarks/src/main/python/peer.py";
        String python = "/usr/bin/python3";
        List<Workload> workloads = Workload.ALL;
        for (int i = 0; i < args.length; i++) {
            switch (args[i]) {
                case "--rounds" -> rounds = Integer.parseInt(args[++i]);
                case "--peer" -> peer = args[++i];
                case "--python" -> python = args[++i];
                case "--only" -> workloads = Arrays.stream(args[++i].split(",")).map(Workload::of).toList();
                default -> {
                    System.err.println("comparison: unknown option '" + args[i]
                            + "'; expected --rounds N, --peer FILE, --python FILE, --only KEY[,KEY]");
                    System.exit(2);
                }
            }
        }
        if (!Files.isRegularFile(Path.of(peer))) {
            System.err.println("comparison: peer script " + peer + " is missing; run from the project root or pass --peer");
            System.exit(2);
        }
        System.out.printf(Locale.ROOT, "settle speed comparison, %s%n", LocalDate.now());
        System.out.printf(Locale.ROOT, "machine: %s, %d cores; %s%n", Machine.cpuModel(),
                Runtime.getRuntime().availableProcessors(), Machine.jvm());
        System.out.printf(Locale.ROOT, "settle kernels: %s%n", Kernels.describe());
        double peak = Peak.measure();
        System.out.printf(Locale.ROOT, "measured FP64 peak of one core (register-only %d-lane FMA loop, best of 8 by "
                + "CPU time): %.1f GFLOP/s%n", Peak.lanes(), peak);

        Path dir = Files.createTempDirectory("settle-comparison");
        Process process = PeerFiles.start(python, peer);
        List<String[][]> table = new ArrayList<>();
        try (PrintWriter to = new PrintWriter(new OutputStreamWriter(process.getOutputStream(), StandardCharsets.UTF_8), true);
                BufferedReader from = new BufferedReader(new InputStreamReader(process.getInputStream(), StandardCharsets.UTF_8))) {
            System.out.println("peer: " + PeerFiles.ask(to, from, "version") + " (OMP/OPENBLAS/MKL_NUM_THREADS=1)");
            System.out.println("both sides: float64, 1 thread, shuffle each epoch, rate/(1 + 0.5 e), full-batch objective "
                    + "at the start and after each epoch; " + rounds + " interleaved rounds after warm-up rounds (until settle has "
                    + "trained " + WARM_UP_SECONDS + " s)");
            System.out.println();
            for (Workload w : workloads) {
                table.add(compare(w, rounds, dir, to, from, peak));
            }
            to.println("quit");
        } finally {
            process.waitFor();
            for (Workload w : workloads) {
                Files.deleteIfExists(dir.resolve(w.key() + ".x"));
                Files.deleteIfExists(dir.resolve(w.key() + ".y"));
            }
            Files.deleteIfExists(dir);
        }
        for (int clock = 0; clock < 2; clock++) {
            System.out.println();
            System.out.println(clock == 0 ? "By the wall clock:" : "By CPU time (settle: the training thread; peer: its process):");
            System.out.println();
            System.out.println("| workload | settle ex/s | idiomatic ex/s | hand-written ex/s | settle/idiomatic median "
                    + "(min–max) | settle/hand median (min–max) | settle GFLOP/s of needed work (% of peak) |");
            System.out.println("| --- | --- | --- | --- | --- | --- | --- |");
            for (String[][] rows : table) {
                System.out.println("| " + String.join(" | ", rows[clock]) + " |");
            }
        }
        System.out.printf(Locale.ROOT, "%nFLOPs of needed work per example: 4 × first-layer weights + 6 × other weights; "
                + "peak %.1f GFLOP/s measured above.%n", peak);
    }

    /**
     * Warm-up rounds run until settle has trained this long on the workload: its JIT compiles the kernels during
     * the first runs (the peer's rounds are repeated alongside and discarded too).
     */
    private static final double WARM_UP_SECONDS = 2.0;

    /**
     * Each timing runs back-to-back replicates of one side for at least this long (the counts are set from the
     * last warm-up round): a core that has just been idle, waiting for the other side, runs its first tens of
     * milliseconds slower, which would otherwise penalise whichever side runs shorter.
     */
    private static final double TIMING_SECONDS = 0.5;

    /** Wall-clock and CPU seconds of one run. */
    private record Timing(double wall, double cpu) {
    }

    private static String[][] compare(Workload w, int rounds, Path dir, PrintWriter to, BufferedReader from, double peak)
            throws IOException {
        Dataset data = w.data(20260101L);
        w.write(data, dir);
        String hidden = w.hidden().length == 0 ? "-"
                : String.join(",", Arrays.stream(w.hidden()).mapToObj(Integer::toString).toList());
        PeerFiles.ask(to, from, String.format(Locale.ROOT, "load %s %s %d %s %d %d %d %d %s", w.key(), dir, w.inputs(), hidden,
                w.classes(), w.batch(), w.rows(), w.epochs(), Double.toString(w.rate())));
        Trainer trainer = w.trainer(data);
        long examples = w.examples();
        System.out.printf(Locale.ROOT, "%s: %s, N=%d, %d epochs, %d updates, %d examples%n", w.key(), w.describe(),
                w.rows(), w.epochs(), (long) w.epochs() * w.updatesPerEpoch(), examples);
        Timing[] settle = new Timing[rounds];
        Timing[] idiomatic = new Timing[rounds];
        Timing[] hand = new Timing[rounds];
        double warmed = 0;
        int seed = 1;
        int[] count = {1, 1, 1};
        for (int round = 0; round <= rounds; ) {
            boolean warmUp = warmed < WARM_UP_SECONDS;
            Timing s = runSettle(trainer, seed, count[0]);
            Timing i = runPeer(to, from, w, "idiomatic", seed, count[1]);
            Timing h = runPeer(to, from, w, "hand", seed, count[2]);
            seed += Math.max(count[0], Math.max(count[1], count[2]));
            System.out.printf(Locale.ROOT, "  %s: settle %.4f s (cpu %.4f), idiomatic %.4f s (cpu %.4f), hand %.4f s "
                    + "(cpu %.4f) per replicate%s%n", warmUp ? "warm-up" : "round " + round, s.wall, s.cpu, i.wall,
                    i.cpu, h.wall, h.cpu, warmUp ? "" : String.format(Locale.ROOT, ", of %d, %d and %d back to back",
                            count[0], count[1], count[2]));
            if (warmUp) {
                warmed += s.wall;
                if (warmed >= WARM_UP_SECONDS) {
                    round = 1;
                    count = new int[] {replicates(s), replicates(i), replicates(h)};
                }
            } else {
                settle[round - 1] = s;
                idiomatic[round - 1] = i;
                hand[round - 1] = h;
                round++;
            }
        }
        double evaluation = evaluationSeconds(w, data);
        double settleCpu = median(settle, true);
        System.out.printf(Locale.ROOT, "  settle spends about %.0f%% of its CPU time in the %d full-batch evaluations%n",
                100 * evaluation * (w.epochs() + 1) / settleCpu, w.epochs() + 1);
        String[][] rows = new String[2][];
        for (int clock = 0; clock < 2; clock++) {
            boolean cpu = clock == 1;
            double[] ratioI = new double[rounds];
            double[] ratioH = new double[rounds];
            for (int r = 0; r < rounds; r++) {
                ratioI[r] = seconds(idiomatic[r], cpu) / seconds(settle[r], cpu);
                ratioH[r] = seconds(hand[r], cpu) / seconds(settle[r], cpu);
            }
            double settleSeconds = median(settle, cpu);
            double gflops = examples * (double) w.flopsPerExample() / settleSeconds * 1e-9;
            rows[clock] = new String[] {
                w.describe(),
                String.format(Locale.ROOT, "%.3g", examples / settleSeconds),
                String.format(Locale.ROOT, "%.3g", examples / median(idiomatic, cpu)),
                String.format(Locale.ROOT, "%.3g", examples / median(hand, cpu)),
                spread(ratioI),
                spread(ratioH),
                String.format(Locale.ROOT, "%.1f (%.0f%%)", gflops, 100 * gflops / peak)};
        }
        return rows;
    }

    private static double seconds(Timing t, boolean cpu) {
        return cpu ? t.cpu : t.wall;
    }

    private static double median(Timing[] timings, boolean cpu) {
        double[] values = new double[timings.length];
        for (int i = 0; i < values.length; i++) {
            values[i] = seconds(timings[i], cpu);
        }
        return median(values);
    }

    /** @return how many back-to-back replicates make one timing of at least {@link #TIMING_SECONDS} */
    private static int replicates(Timing one) {
        return (int) Math.max(1, Math.ceil(TIMING_SECONDS / one.wall));
    }

    /** @return the mean time per replicate of {@code count} replicates from seed {@code first} on, back to back */
    private static Timing runSettle(Trainer trainer, int first, int count) {
        long cpu = Clock.cpuNanos();
        long start = System.nanoTime();
        for (int replicate = first; replicate < first + count; replicate++) {
            ReplicateResult result = trainer.run(ReplicateSeeds.derive(20260101L, replicate));
            if (result.status() != ReplicateResult.Status.FINISHED) {
                throw new IllegalStateException("settle's replicate diverged at update " + result.divergedAt());
            }
        }
        double seconds = (System.nanoTime() - start) * 1e-9;
        double cpuSeconds = (Clock.cpuNanos() - cpu) * 1e-9;
        return new Timing(seconds / count, cpuSeconds / count);
    }

    /** @return the best of three CPU timings of one full-batch objective, in seconds */
    private static double evaluationSeconds(Workload w, Dataset data) {
        FullBatch full = new FullBatch(w.model(), data);
        double[] theta = new double[w.model().parameterCount()];
        w.model().initialise(theta, settle.engine.model.Initialisation.GLOROT, new java.util.SplittableRandom(1));
        double best = Double.MAX_VALUE;
        for (int i = 0; i < 3; i++) {
            long start = Clock.cpuNanos();
            full.objective(theta);
            best = Math.min(best, (Clock.cpuNanos() - start) * 1e-9);
        }
        return best;
    }

    private static Timing runPeer(PrintWriter to, BufferedReader from, Workload w, String variant, int first,
            int count) throws IOException {
        String[] reply = PeerFiles.ask(to, from, "run " + w.key() + " " + variant + " " + first + " " + count).split(" ");
        return new Timing(Double.parseDouble(reply[0]) / count, Double.parseDouble(reply[1]) / count);
    }

    static double median(double[] values) {
        double[] sorted = values.clone();
        Arrays.sort(sorted);
        int n = sorted.length;
        return n % 2 == 1 ? sorted[n / 2] : 0.5 * (sorted[n / 2 - 1] + sorted[n / 2]);
    }

    static String spread(double[] values) {
        double min = Arrays.stream(values).min().orElse(Double.NaN);
        double max = Arrays.stream(values).max().orElse(Double.NaN);
        return String.format(Locale.ROOT, "%.2f× (%.2f–%.2f)", median(values), min, max);
    }
}
