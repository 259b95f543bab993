package settle.reports;

import com.fasterxml.jackson.databind.ObjectMapper;
import com.fasterxml.jackson.databind.node.ArrayNode;
import com.fasterxml.jackson.databind.node.ObjectNode;
import java.io.IOException;
import java.nio.file.Files;
import java.nio.file.Path;
import java.util.ArrayList;
import java.util.LinkedHashMap;
import java.util.List;
import java.util.Map;

/**
 * Writes a study directory in the documented format 4 (the README's study-directory schema) with
 * values chosen by a test: the reports module reads it exactly as it reads a real study. Binary logistic
 * regression with {@code features} weights and a bias; every replicate gets the same per-epoch series and the
 * same prediction unless set. {@link #format} writes an older directory for the tests that refuse one.
 */
final class SyntheticStudy {

    private static final ObjectMapper MAPPER = new ObjectMapper();

    /** One replicate's content. */
    static final class Rep {
        String status = "finished";
        Map<String, Double> metrics = new LinkedHashMap<>();
        double[] last;
        double[] tailMean;
        double[] snapshots;
        int snapshotRows;
        double[] probabilities;
        int classes = 2;
        /** Nudges in force: {from_epoch, factor} with the note at the same index of {@link #nudgeNotes}. */
        List<double[]> nudges = new ArrayList<>();
        List<String> nudgeNotes = new ArrayList<>();
        /** Plateau cuts: {from_epoch, rate}. */
        List<double[]> plateauCuts = new ArrayList<>();
        /** ‖θ − θ*‖ at each epoch end, or null for 1/(epoch); NaN is written as null. */
        double[] distance;
        /** The rate of every update, or null for the arm's default schedule. */
        double[] rates;
        /** The prediction's {@code epoch_distance_sq}, or null for 1.2/epoch²; NaN is written as null. */
        double[] predictedEpochs;
        /** The prediction's {@code tail_distance_sq}, {@code tail_distance_sq_epoch_ends}. */
        double predictedTail = 0.05;
        double predictedTailEpochEnds = 0.04;
        /** The prediction's {@code final_bias_sq} and {@code final_ball}; {@code final_distance_sq} is their sum. */
        double finalBiasSq = 0.001;
        double finalBall = 0.05;
        /** The predicted bias² averaged over the tail; NaN: the same as at the last update. */
        double tailBiasSq = Double.NaN;
        /** The prediction's {@code largest_rate_times_curvature}. */
        double largest = 0.15;
        /** When positive: the prediction is unstable from this update, with this α·λmax there. */
        long unstableFrom;
        double unstableProduct = Double.NaN;
    }

    /** The value of each metric a test leaves unset, for a finished replicate. */
    private static final Map<String, Double> DEFAULTS = Map.ofEntries(Map.entry("final_objective", 0.3),
            Map.entry("final_gap", 1e-3), Map.entry("final_distance", 0.1), Map.entry("tail_radius", 0.1),
            Map.entry("tail_distance", 0.2), Map.entry("tail_radius_epoch_ends", 0.05),
            Map.entry("tail_distance_epoch_ends", 0.18), Map.entry("tail_loss_spread", 1e-3),
            Map.entry("averaged_objective", 0.3), Map.entry("averaged_gap", 1e-4), Map.entry("test_loss", 0.3),
            Map.entry("test_accuracy", 0.9));

    final List<String> arms = new ArrayList<>();
    final List<Boolean> averaged = new ArrayList<>();
    final List<List<Rep>> replicates = new ArrayList<>();
    List<String> featureNames = List.of("x1", "x2");
    String baseline;
    int epochs = 4;
    int updatesPerEpoch = 5;
    boolean convex = true;
    String planText;
    /** The text of nudges.csv, or null for none. */
    String nudgesCsv;
    /** The a-priori bound's value per arm for reference.json (with D = 2, G = 3), or null to leave the block out. */
    double[] bound;
    /** When set, reference.json's bound block says it was skipped, for this reason. */
    String boundSkipped;
    /** The format every file records. */
    int format = 4;
    /** The manifest's executor and threads. */
    String executor = "test";
    int threads = 1;
    /** The plan's momentum β, as the predictions and the manifest's {@code training} record it. */
    double momentum;
    /** The plan's sampling, as the predictions and the manifest's {@code training} record it. */
    String sampling = "shuffle";
    /** The batch size B the manifest's {@code training} records. */
    int batch = 16;
    /** The tail fraction τ and the snapshots K the manifest's {@code training} records. */
    double tail = 0.5;
    int snapshots = 2;
    /** The study's name the manifest records. */
    String study = "synthetic";
    /** The plan's SHA-256 the manifest records ({@code plan_sha256}). */
    String planSha256 = "aa";
    /** The model's λ the manifest records ({@code model_l2}). */
    double l2 = 0.01;
    /** The manifest's {@code grid} entries, written as given (see {@link #grid}). */
    final List<ObjectNode> grids = new ArrayList<>();
    /** Manifest keys left out, for the tests that refuse a manifest without them. */
    final List<String> omitted = new ArrayList<>();

    /**
     * Records a grid entry in the manifest the way the runner expands one: template {@code template} swept over
     * {@code keys} with {@code values} (per key, as written), producing the arms from index {@code firstArm} (0-based)
     * on, one per combination, the last key varying fastest. The arms themselves are added by the test.
     */
    void grid(String template, int firstArm, List<String> keys, List<List<String>> values) {
        ObjectNode g = MAPPER.createObjectNode();
        g.put("arm", template);
        ArrayNode keyList = g.putArray("keys");
        int combinations = 1;
        for (int k = 0; k < keys.size(); k++) {
            ObjectNode key = keyList.addObject().put("name", keys.get(k));
            values.get(k).forEach(key.putArray("values")::add);
            combinations *= values.get(k).size();
        }
        ArrayNode arms = g.putArray("arms");
        for (int c = 0; c < combinations; c++) {
            ObjectNode arm = arms.addObject().put("index", firstArm + c + 1);
            ArrayNode chosen = arm.putArray("values");
            int rest = c;
            String[] picked = new String[keys.size()];
            for (int k = keys.size() - 1; k >= 0; k--) {
                picked[k] = values.get(k).get(rest % values.get(k).size());
                rest /= values.get(k).size();
            }
            for (String v : picked) {
                chosen.add(v);
            }
        }
        grids.add(g);
    }

    /** Adds an arm whose replicates are filled in by the test. */
    List<Rep> arm(String name, boolean average, int count) {
        if (baseline == null) {
            baseline = name;
        }
        arms.add(name);
        averaged.add(average);
        List<Rep> reps = new ArrayList<>();
        for (int k = 0; k < count; k++) {
            Rep r = new Rep();
            r.last = new double[featureNames.size() + 1];
            reps.add(r);
        }
        replicates.add(reps);
        return reps;
    }

    /** Sets the tail radius and the other metrics of arm a's replicates (every other metric a constant). */
    /** Sets each replicate's final gap (the primary metric of a convex study), the others to their defaults. */
    void finalGap(List<Rep> reps, double... values) {
        for (int k = 0; k < values.length; k++) {
            reps.get(k).metrics.put("final_gap", values[k]);
        }
        double[] radius = new double[values.length];
        java.util.Arrays.fill(radius, 0.1);
        tailRadius(reps, radius);
    }

    void tailRadius(List<Rep> reps, double... values) {
        for (int k = 0; k < values.length; k++) {
            Rep r = reps.get(k);
            r.metrics.putIfAbsent("tail_radius", values[k]);
            r.metrics.putIfAbsent("final_gap", 1e-3);
            r.metrics.putIfAbsent("final_distance", 0.1);
            r.metrics.putIfAbsent("tail_distance", 0.2);
            r.metrics.putIfAbsent("tail_radius_epoch_ends", values[k] / 2);
            r.metrics.putIfAbsent("tail_distance_epoch_ends", 0.18);
            r.metrics.putIfAbsent("tail_loss_spread", 1e-3);
            r.metrics.putIfAbsent("averaged_gap", 1e-4);
            r.metrics.putIfAbsent("test_loss", 0.3);
            r.metrics.putIfAbsent("test_accuracy", 0.9);
        }
    }

    /**
     * Writes the study into {@code dir}; replicates listed in {@code skip} ("arm/replicate", from 1) get no
     * file (a partial study).
     */
    Path write(Path dir, String... skip) throws IOException {
        return writeFormat(dir, skip);
    }

    /**
     * @param a the arm's index, from 1
     * @return its id: its name made safe and a made-up hash that differs per index (the fixture has no plan to hash)
     */
    String armId(int a) {
        return format < 4 ? Integer.toString(a) : settle.reports.format.StudyFormat.armId(arms.get(a - 1),
                String.format("%012x", a) + "0".repeat(52));
    }

    /** @return the path of replicate {@code k} of arm {@code a} (both from 1) relative to the study */
    String path(int a, int k) {
        return "arms/" + armId(a) + "/" + k + ".json";
    }

    /** Formats before 4 named an arm's directory by its index; the manifest is refused before anything is read. */
    private Path writeFormat(Path dir, String... skip) throws IOException {
        Files.createDirectories(dir);
        int count = replicates.get(0).size();
        int p = featureNames.size() + 1;
        ObjectNode m = MAPPER.createObjectNode();
        m.put("format", format);
        m.put("study", study);
        ObjectNode tool = m.putObject("tool");
        tool.put("name", "settle");
        tool.put("version", "0.1.0");
        tool.put("git_commit", "");
        m.putObject("jvm").put("vendor", "test").put("name", "test").put("version", "17");
        m.putObject("cpu").put("model", "test").put("arch", "amd64").put("cores", 2);
        m.put("executor", executor);
        m.put("threads", threads);
        m.putArray("command").add("settle").add("run").add("plan.yaml");
        m.put("generator", "L64X128MixRandom");
        m.put("root_seed", 7);
        m.put("started", "2026-01-01T00:00:00Z");
        m.put("ended", "2026-01-01T00:01:00Z");
        m.put("plan_sha256", planSha256);
        m.put("data_sha256", "bb");
        m.put("split_sha256", "cc");
        m.put("settings_sha256", "dd");
        int testRows = testRows();
        ObjectNode data = m.putObject("data");
        data.put("source", "synthetic:test");
        data.put("rows", 100);
        data.put("features", featureNames.size());
        ArrayNode fn = data.putArray("feature_names");
        featureNames.forEach(fn::add);
        data.putArray("class_names").add("no").add("yes");
        data.put("train_rows", 100 - testRows);
        data.put("test_rows", testRows);
        data.put("holdout_rows", 0);
        data.put("updates_per_epoch", updatesPerEpoch);
        m.putNull("standardisation");
        m.put("model", "binary logistic regression, " + featureNames.size() + " features, 2 classes");
        m.put("parameters", p);
        m.put("model_l2", l2);
        m.putObject("training").put("epochs", epochs).put("batch", batch).put("sampling", sampling)
                .put("momentum", momentum).put("tail", tail).put("snapshots", snapshots);
        m.put("reference", convex ? "reference.json" : "none: the model is not convex");
        m.put("baseline", baseline);
        ArrayNode armList = m.putArray("arms");
        for (int a = 0; a < arms.size(); a++) {
            armList.addObject().put("index", a + 1).put("name", arms.get(a)).put("id", armId(a + 1))
                    .put("directory", "arms/" + armId(a + 1));
        }
        m.putArray("grid").addAll(grids);
        ArrayNode repList = m.putArray("replicates");
        for (int a = 0; a < arms.size(); a++) {
            for (int k = 0; k < count; k++) {
                repList.addObject().put("arm", a + 1).put("replicate", k + 1)
                        .put("status", replicates.get(a).get(k).status);
            }
        }
        m.remove(omitted);
        MAPPER.writeValue(dir.resolve("manifest.json").toFile(), m);
        Files.writeString(dir.resolve("plan.yaml"), planText != null ? planText
                : "study: synthetic\nseed: 7\nreplicates: " + count + "\nmodel:\n  kind: logistic\n  l2: 0.01\n");
        if (convex) {
            ObjectNode r = MAPPER.createObjectNode();
            r.put("format", format);
            r.put("model", "binary logistic regression");
            r.put("method", "newton");
            r.put("iterations", 5);
            r.put("converged", true);
            r.put("objective", 0.25);
            r.put("gradient_norm", 1e-12);
            ArrayNode theta = r.putArray("theta");
            for (int j = 0; j < p; j++) {
                theta.add(0.0);
            }
            r.put("gauge_dimension", 0);
            ArrayNode eigen = r.putArray("eigenvalues");
            for (int j = 0; j < p; j++) {
                eigen.add(j == p - 1 ? 0.3 : 0.1 + 0.2 * j / (p - 1));
            }
            r.put("lambda_min", 0.1);
            r.put("lambda_max", 0.3);
            r.put("stability_bound", 2 / 0.3);
            if (boundSkipped != null || bound == null) {
                r.putObject("last_iterate_bound").put("source", "test").put("rates", "planned")
                        .put("skipped", boundSkipped != null ? boundSkipped : "not set by this test");
            } else {
                ObjectNode b = r.putObject("last_iterate_bound");
                b.put("source", "Defazio et al. 2023, Theorem 10 (test)");
                b.put("rates", "planned");
                b.put("d", 2.0);
                b.put("g", 3.0);
                ArrayNode values = b.putArray("arms");
                for (int a = 0; a < bound.length; a++) {
                    values.addObject().put("index", a + 1).put("name", arms.get(a)).put("value", bound[a]);
                }
            }
            MAPPER.writeValue(dir.resolve("reference.json").toFile(), r);
        }
        if (nudgesCsv != null) {
            Files.writeString(dir.resolve("nudges.csv"), nudgesCsv);
        }
        List<String> skipped = List.of(skip);
        for (int a = 0; a < arms.size(); a++) {
            Path armDir = dir.resolve("arms").resolve(armId(a + 1));
            Files.createDirectories(armDir);
            for (int k = 0; k < count; k++) {
                if (skipped.contains((a + 1) + "/" + (k + 1))) {
                    continue;
                }
                ObjectNode r = replicate(a, k, p, testRows);
                if (format >= 4) {
                    Files.write(armDir.resolve((k + 1) + ".bin"), split(r));
                }
                MAPPER.writeValue(armDir.resolve((k + 1) + ".json").toFile(), r);
            }
        }
        return dir;
    }

    /** The arrays format 4 keeps in a replicate's binary file, in the order the README gives. */
    private static final List<String> BLOCKS = List.of("rates", "start", "last", "tail_mean", "snapshots.values",
            "test_probabilities.values");

    /**
     * Moves the large arrays of a format-4 replicate out of its JSON into the bytes of its binary file, written here
     * from the README's layout (not settle's writer): rates and θ vectors as float64 (coding 1), snapshots and test
     * probabilities as float32 (coding 3), then each test row's most probable class (ties to the lower) as one byte
     * (coding 4); records the file's length and CRC-32C in the JSON.
     */
    static byte[] split(ObjectNode r) {
        List<String> names = new ArrayList<>();
        List<double[]> arrays = new ArrayList<>();
        List<int[]> shapes = new ArrayList<>();
        for (String name : BLOCKS) {
            int dot = name.indexOf('.');
            com.fasterxml.jackson.databind.JsonNode parent = dot < 0 ? r : r.get(name.substring(0, dot));
            String key = dot < 0 ? name : name.substring(dot + 1);
            if (parent == null || !parent.isObject() || !parent.path(key).isArray()) {
                continue;
            }
            ArrayNode values = (ArrayNode) ((ObjectNode) parent).remove(key);
            double[] v = new double[values.size()];
            for (int i = 0; i < v.length; i++) {
                v[i] = values.get(i).isNull() ? Double.NaN : values.get(i).asDouble();
            }
            names.add(name);
            arrays.add(v);
            shapes.add(dot < 0 ? new int[] {1, v.length} : new int[] {parent.path("rows").asInt(),
                    parent.path("columns").asInt()});
            if (name.equals("test_probabilities.values")) {
                int rows = shapes.get(shapes.size() - 1)[0];
                int k = shapes.get(shapes.size() - 1)[1];
                double[] best = new double[rows];
                for (int row = 0; row < rows; row++) {
                    for (int c = 1; c < k; c++) {
                        if (v[row * k + c] > v[row * k + (int) best[row]]) {
                            best[row] = c;
                        }
                    }
                }
                names.add("test_probabilities.classes");
                arrays.add(best);
                shapes.add(new int[] {rows, 1});
            }
        }
        int[] width = new int[names.size()];
        int[] coding = new int[names.size()];
        int size = 16 + 48 * names.size() + 4;
        for (int i = 0; i < names.size(); i++) {
            String name = names.get(i);
            coding[i] = name.endsWith(".classes") ? 4 : name.endsWith(".values") ? 3 : 1;
            width[i] = coding[i] == 4 ? 1 : coding[i] == 3 ? 4 : 8;
            size += width[i] * arrays.get(i).length;
        }
        java.nio.ByteBuffer b = java.nio.ByteBuffer.allocate(size).order(java.nio.ByteOrder.LITTLE_ENDIAN);
        b.put("SETTLEBN".getBytes(java.nio.charset.StandardCharsets.US_ASCII)).putInt(4).putInt(names.size());
        for (int i = 0; i < names.size(); i++) {
            b.put(java.util.Arrays.copyOf(names.get(i).getBytes(java.nio.charset.StandardCharsets.US_ASCII), 32));
            b.putInt(shapes.get(i)[0]).putInt(shapes.get(i)[1]).putInt(coding[i])
                    .putInt(width[i] * arrays.get(i).length);
        }
        for (int i = 0; i < names.size(); i++) {
            for (double x : arrays.get(i)) {
                switch (coding[i]) {
                    case 4 -> b.put((byte) x);
                    case 3 -> b.putFloat(Double.isNaN(x) ? Float.NaN : (float) x);
                    default -> b.putDouble(x);
                }
            }
        }
        java.util.zip.CRC32C crc = new java.util.zip.CRC32C();
        crc.update(b.array(), 0, size - 4);
        b.putInt((int) crc.getValue());
        r.putObject("binary").put("bytes", size).put("crc32c", String.format("%08x", crc.getValue()));
        return b.array();
    }

    /** @return the test rows: those of the probabilities a test set, else 20 */
    private int testRows() {
        for (List<Rep> arm : replicates) {
            for (Rep r : arm) {
                if (r.probabilities != null) {
                    return r.probabilities.length / r.classes;
                }
            }
        }
        return 20;
    }

    private ObjectNode replicate(int a, int k, int p, int testRows) {
        Rep rep = replicates.get(a).get(k);
        boolean diverged = rep.status.equals("diverged");
        ObjectNode r = MAPPER.createObjectNode();
        r.put("format", format);
        r.put("arm_id", armId(a + 1));
        r.put("arm_name", arms.get(a));
        r.put("replicate", k + 1);
        r.putObject("seeds").put("algorithm", "L64X128MixRandom").put("root", 7).put("initialisation", 100 + k)
                .put("sampling", 200 + k);
        r.put("status", rep.status);
        r.put("diverged_at_update", diverged ? 7 : 0);
        r.put("total_updates", epochs * updatesPerEpoch);
        r.put("updates_run", diverged ? 7 : epochs * updatesPerEpoch);
        r.put("average", averaged.get(a) ? "tail" : "none");
        r.put("initial_objective", 0.69);
        ObjectNode metrics = r.putObject("metrics");
        List<String> convexOnly = List.of("final_gap", "final_distance", "tail_distance", "tail_distance_epoch_ends",
                "averaged_gap");
        for (String key : List.of("final_objective", "final_gap", "final_distance", "tail_radius", "tail_distance",
                "tail_radius_epoch_ends", "tail_distance_epoch_ends", "tail_loss_spread", "averaged_objective",
                "averaged_gap", "test_loss", "test_accuracy")) {
            Double v = rep.metrics.get(key);
            if (v == null) {
                v = DEFAULTS.get(key);
            }
            number(metrics, key, diverged || !convex && convexOnly.contains(key) ? Double.NaN : v);
        }
        if (diverged) {
            r.putNull("tail");
        } else {
            ObjectNode tail = r.putObject("tail");
            int total = epochs * updatesPerEpoch;
            int shots = Math.max(1, rep.snapshotRows);
            int length = Math.max(2, shots);
            tail.put("first_update", total - length + 1);
            tail.put("length", length);
            tail.put("epoch_ends", 1);
            tail.put("snapshots", shots);
            ArrayNode updates = tail.putArray("snapshot_updates");
            ArrayNode objectives = tail.putArray("snapshot_objectives");
            for (int i = 0; i < shots; i++) {
                updates.add(total - shots + 1 + i);
                objectives.add(0.25);
            }
        }
        ObjectNode e = r.putObject("epochs");
        int n = diverged ? 1 : epochs;
        ArrayNode epoch = e.putArray("epoch");
        ArrayNode lastUpdate = e.putArray("last_update");
        ArrayNode rate = e.putArray("rate");
        ArrayNode objective = e.putArray("objective");
        ArrayNode holdout = e.putArray("holdout_loss");
        ArrayNode testLoss = e.putArray("test_loss");
        ArrayNode testAccuracy = e.putArray("test_accuracy");
        ArrayNode distance = e.putArray("distance");
        for (int i = 0; i < n; i++) {
            epoch.add(i + 1);
            lastUpdate.add((i + 1) * updatesPerEpoch);
            rate.add(0.5 / (1 + a * i));
            objective.add(0.25 + 0.1 / (i + 1) + 0.001 * k);
            holdout.addNull();
            testLoss.add(0.3);
            testAccuracy.add(0.9);
            if (convex) {
                add(distance, rep.distance != null ? rep.distance[i] : 1.0 / (i + 1));
            } else {
                distance.addNull();
            }
        }
        ArrayNode rates = r.putArray("rates");
        for (int u = 0; u < (diverged ? 7 : epochs * updatesPerEpoch); u++) {
            rates.add(rep.rates != null ? rep.rates[u] : 0.5 / (1 + a * (u / updatesPerEpoch)));
        }
        ArrayNode nudges = r.putArray("nudges");
        for (int i = 0; i < rep.nudges.size(); i++) {
            nudges.addObject().put("from_epoch", (int) rep.nudges.get(i)[0]).put("factor", rep.nudges.get(i)[1])
                    .put("note", rep.nudgeNotes.get(i));
        }
        ArrayNode cuts = r.putArray("plateau_cuts");
        for (double[] c : rep.plateauCuts) {
            cuts.addObject().put("from_epoch", (int) c[0]).put("rate", c[1]);
        }
        array(r.putArray("start"), new double[p]);
        array(r.putArray("last"), rep.last);
        if (diverged) {
            r.putNull("tail_mean");
        } else {
            array(r.putArray("tail_mean"), rep.tailMean != null ? rep.tailMean : rep.last);
        }
        if (diverged || rep.snapshots == null) {
            r.putNull("snapshots");
        } else {
            ObjectNode s = r.putObject("snapshots");
            s.put("rows", rep.snapshotRows);
            s.put("columns", p);
            ArrayNode values = s.putArray("values");
            for (double v : rep.snapshots) {
                add(values, v);
            }
        }
        if (diverged) {
            r.putNull("test_probabilities");
        } else {
            // without probabilities set by the test, every replicate puts each test row in class 0 with 0.7
            double[] probabilities = rep.probabilities;
            if (probabilities == null) {
                probabilities = new double[testRows * rep.classes];
                for (int i = 0; i < testRows; i++) {
                    for (int c = 0; c < rep.classes; c++) {
                        probabilities[i * rep.classes + c] = c == 0 ? 0.7 : 0.3 / (rep.classes - 1);
                    }
                }
            }
            ObjectNode s = r.putObject("test_probabilities");
            s.put("rows", probabilities.length / rep.classes);
            s.put("columns", rep.classes);
            array(s.putArray("values"), probabilities);
        }
        ObjectNode pr = r.putObject("prediction");
        if (convex && !diverged) {
            boolean stable = rep.unstableFrom <= 0;
            double limit = 2 * (1 + momentum);
            pr.put("predicted", true);
            pr.put("kind", "first-order");
            pr.put("label", "first-order: logistic regression linearised at θ*");
            pr.put("sampling", sampling);
            pr.put("momentum", momentum);
            pr.put("stability_bound", limit / 0.3);
            pr.put("largest_rate_times_curvature", rep.largest);
            pr.put("stable", stable);
            if (stable) {
                pr.putNull("unstable_from_update");
                pr.putNull("unstable_rate_times_curvature");
            } else {
                pr.put("unstable_from_update", rep.unstableFrom);
                number(pr, "unstable_rate_times_curvature", rep.unstableProduct);
            }
            ArrayNode d = pr.putArray("epoch_distance_sq");
            ArrayNode excess = pr.putArray("epoch_excess_loss");
            for (int i = 0; i < epochs; i++) {
                double v = rep.predictedEpochs != null ? rep.predictedEpochs[i] : 1.2 / ((i + 1) * (i + 1));
                if (!stable && (i + 1) * (long) updatesPerEpoch >= rep.unstableFrom) {
                    v = Double.NaN;
                }
                add(d, v);
                add(excess, v * 0.15);
            }
            pr.put("tail_updates", 2);
            number(pr, "tail_distance_sq", stable ? rep.predictedTail : Double.NaN);
            pr.put("tail_epoch_ends", 1);
            number(pr, "tail_distance_sq_epoch_ends", stable ? rep.predictedTailEpochEnds : Double.NaN);
            number(pr, "tail_excess_loss", stable ? rep.predictedTail * 0.15 : Double.NaN);
            number(pr, "final_distance_sq", stable ? rep.finalBiasSq + rep.finalBall : Double.NaN);
            number(pr, "final_excess_loss", stable ? (rep.finalBiasSq + rep.finalBall) * 0.15 : Double.NaN);
            number(pr, "final_bias_sq", stable ? rep.finalBiasSq : Double.NaN);
            number(pr, "final_ball", stable ? rep.finalBall : Double.NaN);
            number(pr, "tail_bias_sq", stable ? (Double.isNaN(rep.tailBiasSq) ? rep.finalBiasSq : rep.tailBiasSq)
                    : Double.NaN);
            number(pr, "tail_ball", stable ? rep.finalBall : Double.NaN);
            ObjectNode f = pr.putObject("fixed_point");
            f.put("rate", 0.5);
            f.put("batch", 16);
            f.put("exists", stable);
            number(f, "distance_sq", stable ? rep.predictedTail : Double.NaN);
            number(f, "distance_sq_epoch_end", stable ? rep.predictedTailEpochEnds : Double.NaN);
            number(f, "excess_loss", stable ? rep.predictedTail * 0.15 : Double.NaN);
            f.put("note", stable ? "the stationary ball at the last rate" : "α·λmax ≥ 2(1 + β): no stationary ball");
        } else {
            pr.put("predicted", false);
            pr.put("skipped", convex ? "the replicate diverged" : "the model is not convex");
        }
        return r;
    }

    /** Writes v, or null when it is not finite (as the runner does). */
    private static void number(ObjectNode node, String key, double v) {
        if (Double.isFinite(v)) {
            node.put(key, v);
        } else {
            node.putNull(key);
        }
    }

    private static void add(ArrayNode node, double v) {
        if (Double.isFinite(v)) {
            node.add(v);
        } else {
            node.addNull();
        }
    }

    private static void array(ArrayNode node, double[] values) {
        for (double v : values) {
            node.add(v);
        }
    }
}
