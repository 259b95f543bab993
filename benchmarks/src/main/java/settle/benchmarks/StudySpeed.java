package settle.benchmarks;

import java.io.BufferedReader;
import java.io.IOException;
import java.io.InputStreamReader;
import java.io.OutputStreamWriter;
import java.io.PrintWriter;
import java.nio.charset.StandardCharsets;
import java.nio.file.Files;
import java.nio.file.Path;
import java.time.Instant;
import java.util.ArrayList;
import java.util.Arrays;
import java.util.List;
import java.util.Locale;
import java.util.Map;
import java.util.stream.Collectors;
import settle.datasets.Dataset;
import settle.engine.model.Kernels;
import settle.engine.train.TailPlan;
import settle.engine.train.Trainer;
import settle.experiments.plan.ArmPlan;
import settle.experiments.plan.ParsedPlan;
import settle.experiments.plan.PlanParser;
import settle.experiments.run.ReplicateKey;
import settle.experiments.run.ReplicateOutcome;
import settle.experiments.study.StudyContext;
import settle.experiments.study.StudyRunner;

/**
 * Study-level speed: a whole study (the demo's six arms × 12 replicates) trained as {@code settle run} trains it,
 * with the arms of a replicate trained together (fusion on) and apart ({@code --arms-apart}, fusion off), against
 * the PyTorch peer ({@code peer.py}, variant {@code study}) training the same arms batched: stacked weights,
 * batched matrix products, the same updates at the same rates and the same full-batch evaluations.
 *
 * <p>settle's side is the runner's own code: the plan is parsed by {@link PlanParser}, the data loaded, split and
 * standardised and θ* found by {@link StudyContext} (before the clock starts), the units of work cut by
 * {@link StudyRunner#units} and each unit trained into its replicate files' bytes by {@link StudyRunner#outcomes},
 * on one thread ({@code settle run --threads 1}); only writing the bytes to disk is left out. The files of the
 * two settle runs are compared byte for byte.
 *
 * <p>Usage: {@code java --add-modules jdk.incubator.vector -cp benchmarks.jar settle.benchmarks.StudySpeed
 * [--rounds R] [--peer PATH/peer.py] [--python /usr/bin/python3] [--only logistic,mlp] [--replicates N]}.
 */
public final class StudySpeed {

    private StudySpeed() {
    }

    /**
     * A study workload: a {@link Workload}'s model, batch, training rows and epochs under the demo's six arms.
     *
     * @param key the name on the command line
     * @param base the per-replicate workload whose shape and data generator it takes
     * @param rate the arms' initial rate
     */
    private record StudyWorkload(String key, Workload base, double rate) {
    }

    private static final List<StudyWorkload> ALL = List.of(
            new StudyWorkload("logistic", Workload.of("logistic-b64"), 0.5),
            new StudyWorkload("mlp", Workload.of("mlp-64-128-10-b64"), 0.05));

    /** The fraction of rows held out for the test split, as the demo plan has it. */
    private static final double TEST_FRACTION = 0.2;

    /** Each round trains at least this long per side before the timing counts (the first round is a warm-up). */
    private static final double WARM_UP_SECONDS = 2.0;

    /** Relative difference allowed between settle's and the peer's mean final objective per arm. */
    private static final double SANITY_TOLERANCE = 0.05;

    /**
     * Seconds of one study: by the wall clock, by CPU time (settle: the whole JVM process, garbage collection and
     * compiler threads included, as the peer's process time includes its own), and settle's training thread alone.
     */
    private record Timing(double wall, double cpu, double thread) {
    }

    /** Runs the comparison; see the class comment for the options. */
    public static void main(String[] args) throws Exception {
        int rounds = 5;
        int replicates = 12;
        String peer = "benchmarks/src/main/python/peer.py";
        String python = "/usr/bin/python3";
        List<StudyWorkload> workloads = ALL;
        for (int i = 0; i < args.length; i++) {
            switch (args[i]) {
                case "--rounds" -> rounds = Integer.parseInt(args[++i]);
                case "--replicates" -> replicates = Integer.parseInt(args[++i]);
                case "--peer" -> peer = args[++i];
                case "--python" -> python = args[++i];
                case "--only" -> {
                    List<String> keys = Arrays.asList(args[++i].split(","));
                    workloads = ALL.stream().filter(w -> keys.contains(w.key)).toList();
                }
                default -> {
                    System.err.println("study comparison: unknown option '" + args[i] + "'; expected --rounds N, "
                            + "--replicates N, --peer FILE, --python FILE, --only logistic,mlp");
                    System.exit(2);
                }
            }
        }
        if (!Files.isRegularFile(Path.of(peer))) {
            System.err.println("study comparison: peer script " + peer + " is missing; run from the project root or "
                    + "pass --peer");
            System.exit(2);
        }
        System.out.printf(Locale.ROOT, "settle study speed comparison, %s%n", Instant.now());
        System.out.printf(Locale.ROOT, "machine: %s, %d cores; %s%n", Machine.cpuModel(),
                Runtime.getRuntime().availableProcessors(), Machine.jvm());
        System.out.printf(Locale.ROOT, "settle kernels: %s%n", Kernels.describe());
        Path dir = Files.createTempDirectory("settle-study-comparison");
        Process process = PeerFiles.start(python, peer);
        List<String> table = new ArrayList<>();
        try (PrintWriter to = new PrintWriter(new OutputStreamWriter(process.getOutputStream(), StandardCharsets.UTF_8), true);
                BufferedReader from = new BufferedReader(new InputStreamReader(process.getInputStream(), StandardCharsets.UTF_8))) {
            System.out.println("peer: " + PeerFiles.ask(to, from, "version") + " (OMP/OPENBLAS/MKL_NUM_THREADS=1)");
            System.out.println("both sides: float64, 1 training thread, by CPU time of the whole process (settle's "
                    + "JVM: training thread, garbage collector and JIT; the peer: time.process_time()); " + rounds + " interleaved rounds (fusion on, fusion off, peer) after one warm-up round");
            System.out.println();
            for (StudyWorkload w : workloads) {
                table.add(compare(w, replicates, rounds, dir, to, from));
            }
            to.println("quit");
        } finally {
            process.waitFor();
            try (var files = Files.list(dir)) {
                for (Path p : files.toList()) {
                    Files.deleteIfExists(p);
                }
            }
            Files.deleteIfExists(dir);
        }
        System.out.println();
        System.out.println("By process CPU time, median of the rounds (min–max):");
        System.out.println();
        System.out.println("| study | fusion on (s) | fusion off (s) | batched peer (s) | fusion on / off | settle (fusion on) "
                + "/ batched peer |");
        System.out.println("| --- | --- | --- | --- | --- | --- |");
        table.forEach(System.out::println);
        System.out.println();
        System.out.println("Gates: fusion on/off ≥ 2× logistic, ≥ 1.5× MLP; settle / batched peer ≥ 1.5× on both.");
    }

    private static String compare(StudyWorkload w, int replicates, int rounds, Path dir, PrintWriter to,
            BufferedReader from) throws IOException {
        Workload base = w.base;
        // the plan takes the test split out of all rows: this many rows leave the workload's N for training
        int all = (int) Math.round(base.rows() / (1 - TEST_FRACTION));
        Dataset data = base.withRows(all).data(20260101L);
        Path csv = dir.resolve(w.key + ".csv");
        writeCsv(data, csv);
        Path planFile = dir.resolve(w.key + ".yaml");
        Files.writeString(planFile, plan(w, replicates, csv));
        ParsedPlan parsed = PlanParser.read(planFile);
        long prepare = System.nanoTime();
        StudyContext context = StudyContext.build(parsed);
        Dataset train = context.data().train();
        Dataset test = context.data().test();
        int arms = context.plan().arms().size();
        Trainer lead = context.trainer(1);
        long updates = lead.shape().totalUpdates();
        TailPlan tail = TailPlan.of(updates, 0.1, 50, lead.shape().updatesPerEpoch());
        System.out.printf(Locale.ROOT, "%s study: %s, %d arms × %d replicates, N = %d training rows (%d test), %d epochs,"
                        + " %d updates per replicate, tail %d updates, %d snapshots; plan, data, split and θ* ready in %.1f s%n",
                w.key, base.describe(), arms, replicates, train.rows(), test.rows(), base.epochs(), updates,
                tail.length(), tail.snapshots(), (System.nanoTime() - prepare) * 1e-9);
        writePeerData(w.key, dir, train, test, context, tail, arms);
        String hidden = base.hidden().length == 0 ? "-"
                : String.join(",", Arrays.stream(base.hidden()).mapToObj(Integer::toString).toList());
        boolean[] averaged = new boolean[arms];
        StringBuilder averageFlags = new StringBuilder();
        for (int a = 0; a < arms; a++) {
            averaged[a] = context.plan().arms().get(a).average() == ArmPlan.Averaging.TAIL;
            averageFlags.append(a == 0 ? "" : ",").append(averaged[a] ? 1 : 0);
        }
        PeerFiles.ask(to, from, String.format(Locale.ROOT, "study %s %s %d %s %d %d %d %d %s %s", w.key, dir, train.features(),
                hidden, train.classes(), base.batch(), base.epochs(), arms, Double.toString(context.model().l2()),
                averageFlags));

        List<ReplicateKey> keys = context.keys();
        List<List<ReplicateKey>> together = StudyRunner.units(context, keys, true);
        List<List<ReplicateKey>> apart = StudyRunner.units(context, keys, false);
        System.out.printf(Locale.ROOT, "  units of work: %d with fusion on, %d with fusion off%n", together.size(),
                apart.size());
        Timing[] on = new Timing[rounds];
        Timing[] off = new Timing[rounds];
        Timing[] peer = new Timing[rounds];
        String peerReply = null;
        Map<ReplicateKey, ReplicateOutcome> firstOn = null;
        Map<ReplicateKey, ReplicateOutcome> firstOff = null;
        double warmed = 0;
        for (int round = 0; round <= rounds; ) {
            Map<ReplicateKey, ReplicateOutcome> outOn = new java.util.HashMap<>();
            Map<ReplicateKey, ReplicateOutcome> outOff = new java.util.HashMap<>();
            Timing s = runSettle(context, together, outOn);
            Timing sOff = runSettle(context, apart, outOff);
            String[] reply = PeerFiles.ask(to, from, "trainstudy " + w.key + " 1 " + replicates).split(" ");
            Timing p = new Timing(Double.parseDouble(reply[0]), Double.parseDouble(reply[1]), Double.NaN);
            boolean warmUp = round == 0;
            System.out.printf(Locale.ROOT, "  %s: fusion on %.3f s (cpu %.3f, thread %.3f), fusion off %.3f s (cpu %.3f, "
                            + "thread %.3f), peer %.3f s (cpu %.3f)%n", warmUp ? "warm-up" : "round " + round, s.wall,
                    s.cpu, s.thread, sOff.wall, sOff.cpu, sOff.thread, p.wall, p.cpu);
            if (firstOn == null) {
                firstOn = outOn;
                firstOff = outOff;
                peerReply = String.join(" ", reply);
            }
            if (warmUp) {
                warmed += s.wall;
                if (warmed >= WARM_UP_SECONDS) {
                    round = 1;
                }
            } else {
                on[round - 1] = s;
                off[round - 1] = sOff;
                peer[round - 1] = p;
                round++;
            }
        }
        // the files of both settle runs, byte for byte
        int same = 0;
        for (ReplicateKey key : keys) {
            ReplicateOutcome a = firstOn.get(key);
            ReplicateOutcome b = firstOff.get(key);
            if (a != null && b != null && Arrays.equals(a.file().json(), b.file().json())
                    && Arrays.equals(a.file().binary(), b.file().binary())) {
                same++;
            }
        }
        System.out.printf(Locale.ROOT, "  replicate files byte-identical with fusion on and off: %d of %d%n", same,
                keys.size());
        if (same != keys.size()) {
            throw new IllegalStateException("fusion changed replicate files: " + (keys.size() - same) + " differ");
        }
        sanity(peerReply, firstOn, context, arms, replicates, updates, tail);

        double[] ratioFusion = new double[rounds];
        double[] ratioPeer = new double[rounds];
        for (int r = 0; r < rounds; r++) {
            ratioFusion[r] = off[r].cpu / on[r].cpu;
            ratioPeer[r] = peer[r].cpu / on[r].cpu;
        }
        double[] ratioThread = new double[rounds];
        for (int r = 0; r < rounds; r++) {
            ratioThread[r] = off[r].thread / on[r].thread;
        }
        System.out.printf(Locale.ROOT, "  fusion on / off %s; settle / batched peer %s (by the wall clock: %s, %s; "
                        + "fusion on / off by the training thread's CPU time %s)%n",
                PeerSpeed.spread(ratioFusion), PeerSpeed.spread(ratioPeer),
                PeerSpeed.spread(wallRatios(off, on)), PeerSpeed.spread(wallRatios(peer, on)),
                PeerSpeed.spread(ratioThread));
        return String.format(Locale.ROOT, "| %s, %d arms × %d replicates | %.2f | %.2f | %.2f | %s | %s |",
                base.describe(), arms, replicates, medianCpu(on), medianCpu(off), medianCpu(peer),
                PeerSpeed.spread(ratioFusion), PeerSpeed.spread(ratioPeer));
    }

    private static double[] wallRatios(Timing[] slow, Timing[] fast) {
        double[] r = new double[slow.length];
        for (int i = 0; i < r.length; i++) {
            r[i] = slow[i].wall / fast[i].wall;
        }
        return r;
    }

    private static double medianCpu(Timing[] t) {
        return PeerSpeed.median(Arrays.stream(t).mapToDouble(Timing::cpu).toArray());
    }

    /**
     * Checks that the peer did the same work (arms, updates, full-batch evaluations of the training split) and
     * prints its mean final objective per arm beside settle's.
     */
    private static void sanity(String reply, Map<ReplicateKey, ReplicateOutcome> settle, StudyContext context, int arms,
            int replicates, long updates, TailPlan tail) {
        // reply: WALL CPU ARMS UPDATES EVALUATIONS F1,F2,...
        String[] parts = reply.split(" ");
        int peerArms = Integer.parseInt(parts[2]);
        long peerUpdates = Long.parseLong(parts[3]);
        long peerEvaluations = Long.parseLong(parts[4]);
        double[] peerFinal = Arrays.stream(parts[5].split(",")).mapToDouble(Double::parseDouble).toArray();
        int epochs = context.plan().training().epochs();
        // per arm and replicate: F(θ₀) and every epoch end, the snapshots but the last (the last epoch end's), θ̄
        long settleEvaluations = (long) arms * replicates * (epochs + 1 + tail.snapshots() - 1 + 1);
        long settleUpdates = (long) arms * replicates * updates;
        System.out.printf(Locale.ROOT, "  work: settle %d arms, %d updates, %d full-batch evaluations of the training "
                + "split; peer %d arms, %d updates, %d evaluations%n", arms, settleUpdates, settleEvaluations, peerArms,
                peerUpdates, peerEvaluations);
        if (peerArms != arms || peerUpdates != settleUpdates || peerEvaluations != settleEvaluations) {
            throw new IllegalStateException("the peer did not do the same work as settle");
        }
        double[] mean = new double[arms];
        for (Map.Entry<ReplicateKey, ReplicateOutcome> e : settle.entrySet()) {
            String[] lines = e.getValue().epochRows().strip().split("\n");
            String[] last = lines[lines.length - 1].split(",");
            mean[e.getKey().arm() - 1] += Double.parseDouble(last[6]) / replicates;
        }
        StringBuilder line = new StringBuilder("  mean final objective per arm (settle / peer):");
        double worst = 0;
        for (int a = 0; a < arms; a++) {
            double difference = Math.abs(mean[a] - peerFinal[a]) / Math.abs(mean[a]);
            worst = Math.max(worst, difference);
            line.append(String.format(Locale.ROOT, " %s %.5f / %.5f;", context.plan().arms().get(a).name(), mean[a],
                    peerFinal[a]));
        }
        System.out.println(line);
        System.out.printf(Locale.ROOT, "  largest relative difference %.4f (tolerance %.2f: other seeds and "
                + "initialisation streams, the same problem)%n", worst, SANITY_TOLERANCE);
        if (worst > SANITY_TOLERANCE) {
            throw new IllegalStateException("the peer's final objectives differ from settle's by more than the tolerance");
        }
    }

    /** @return one study trained on this thread through the runner's units of work; outcomes kept by key */
    private static Timing runSettle(StudyContext context, List<List<ReplicateKey>> units,
            Map<ReplicateKey, ReplicateOutcome> out) {
        long thread = Clock.cpuNanos();
        long cpu = Clock.processCpuNanos();
        long start = System.nanoTime();
        for (List<ReplicateKey> unit : units) {
            StudyRunner.outcomes(context, unit, outcome -> out.put(outcome.key(), outcome));
        }
        return new Timing((System.nanoTime() - start) * 1e-9, (Clock.processCpuNanos() - cpu) * 1e-9,
                (Clock.cpuNanos() - thread) * 1e-9);
    }

    /** @return the plan: the demo's six arms and training keys on the workload's model, batch and epochs */
    private static String plan(StudyWorkload w, int replicates, Path csv) {
        Workload base = w.base;
        String model = base.hidden().length == 0 ? "  kind: logistic\n"
                : "  kind: mlp\n  hidden: [" + Arrays.stream(base.hidden()).mapToObj(Integer::toString)
                        .collect(Collectors.joining(", ")) + "]\n  activation: relu\n";
        String r = Double.toString(w.rate);
        return "study: speed-" + w.key + "\n"
                + "seed: 2026\n"
                + "replicates: " + replicates + "\n"
                + "data:\n"
                + "  source: \"csv:" + csv.toAbsolutePath() + "\"\n"
                + "  label: y\n"
                + "  test-fraction: " + TEST_FRACTION + "\n"
                + "  standardize: true\n"
                + "model:\n" + model
                + "  l2: 1.0e-3\n"
                + "training:\n"
                + "  epochs: " + base.epochs() + "\n"
                + "  batch: " + base.batch() + "\n"
                + "  sampling: shuffle\n"
                + "  tail: 0.1\n"
                + "  snapshots: 50\n"
                + "baseline: constant\n"
                + "arms:\n"
                + "  - name: constant\n    schedule: {kind: constant, rate: " + r + "}\n"
                + "  - name: averaged\n    schedule: {kind: constant, rate: " + r + "}\n    average: tail\n"
                + "  - name: reciprocal\n    schedule: {kind: reciprocal, rate: " + r + ", decay: 0.25, per: epoch}\n"
                + "  - name: inverse-sqrt\n    schedule: {kind: power-law, rate: " + r + ", power: 0.5, per: epoch}\n"
                + "  - name: halving\n    schedule: {kind: stepped, rate: " + r + ", cut: 0.5, every: "
                + Math.max(1, base.epochs() / 2) + "}\n"
                + "  - name: cosine\n    schedule: {kind: cosine, rate: " + r + ", floor: " + (w.rate / 100) + "}\n";
    }

    /** Writes the data set as the CSV the plan reads: the features x0…, then the label y as c0, c1, …. */
    private static void writeCsv(Dataset data, Path csv) throws IOException {
        double[] x = data.featureMatrix();
        int[] y = data.labels();
        int d = data.features();
        StringBuilder out = new StringBuilder(data.rows() * d * 20);
        for (int j = 0; j < d; j++) {
            out.append('x').append(j).append(',');
        }
        out.append("y\n");
        for (int r = 0; r < data.rows(); r++) {
            for (int j = 0; j < d; j++) {
                out.append(x[r * d + j]).append(',');
            }
            out.append('c').append(y[r]).append('\n');
        }
        Files.writeString(csv, out);
    }

    /**
     * Writes what the peer trains on: the training and test splits as settle's trainer sees them (standardised),
     * every arm's planned rate at every update, and the tail's first update and snapshot updates.
     */
    private static void writePeerData(String key, Path dir, Dataset train, Dataset test, StudyContext context,
            TailPlan tail, int arms) throws IOException {
        PeerFiles.writeDoubles(dir.resolve(key + ".train.x"), train.featureMatrix());
        PeerFiles.writeInts(dir.resolve(key + ".train.y"), train.labels());
        PeerFiles.writeDoubles(dir.resolve(key + ".test.x"), test.featureMatrix());
        PeerFiles.writeInts(dir.resolve(key + ".test.y"), test.labels());
        List<double[]> planned = context.plannedRates();
        int t = planned.get(0).length;
        double[] rates = new double[arms * t];
        for (int a = 0; a < arms; a++) {
            System.arraycopy(planned.get(a), 0, rates, a * t, t);
        }
        PeerFiles.writeDoubles(dir.resolve(key + ".rates"), rates);
        long[] snapshots = tail.snapshotUpdates();
        int[] tailInfo = new int[snapshots.length + 1];
        tailInfo[0] = (int) tail.firstUpdate();
        for (int s = 0; s < snapshots.length; s++) {
            tailInfo[s + 1] = (int) snapshots[s];
        }
        PeerFiles.writeInts(dir.resolve(key + ".tail"), tailInfo);
    }
}
