package settle.reports.format;

import com.fasterxml.jackson.core.JsonGenerator;
import java.io.IOException;
import java.util.ArrayList;
import java.util.List;
import settle.input.BadInputException;
import settle.reports.format.JsonIn.Obj;
import settle.reports.format.JsonIn.Range;
import settle.reports.format.ReplicateBlocks.Coding;

/**
 * The replicate file {@code arms/<arm id>/<replicate>.json}: its one writer and its one reader. Every field is described
 * in the README's study-directory schema. The file holds no wall-clock time, so the same plan and seeds give the same
 * bytes on any machine, thread count, executor or JDK.
 *
 * <p>Reading checks every field: present, of its type and in its range (distances, radii, losses and rates ≥ 0;
 * accuracies and probabilities in [0, 1], each row of probabilities summing to 1; series and vectors of the lengths the
 * study's P, K, N_test, updates per epoch and T give), that the file is the replicate its path names, and that its
 * parts agree (status, divergence, update counts, tail). A file that fails is refused with one line naming it and the
 * field; the runner sets such a file aside and trains the replicate again.
 */
public final class ReplicateJson {

    /** The one key of {@code metrics} that is not a {@link Metric}: F(θ̄), written before {@code averaged_gap}. */
    private static final String AVERAGED_OBJECTIVE = "averaged_objective";
    /** Tolerance on the sum of a row of test probabilities, per class (K values in [0, 1] summed in double). */
    private static final double PROBABILITY_SUM_TOLERANCE = 1e-9;
    /**
     * Further tolerance on the sum of a row of test probabilities stored as float32: each value is within 2⁻²⁴ of its
     * own size, or 2⁻¹⁵⁰ below float32's normal range, so a row summing to 1 moves by at most 2⁻²⁴ + K·2⁻¹⁵⁰.
     */
    static final double FLOAT32_SUM_TOLERANCE = 0x1p-24;

    private ReplicateJson() {
    }

    /**
     * What the study says a replicate file must hold.
     *
     * @param armId the arm's id ({@link StudyFormat#armId}), the name of its directory
     * @param armName the arm's name
     * @param replicate the replicate (from 1)
     * @param rootSeed the plan's root seed
     * @param seeds the replicate's derived seeds, or null when not known (the report does not derive them)
     * @param parameters P
     * @param classes K, the number of classes
     * @param testRows N_test, the rows of the test split
     * @param updatesPerEpoch updates in one epoch
     * @param totalUpdates T (the runner's plan, the report's manifest: epochs × updates per epoch), or −1 when not
     *     known (then any whole number of epochs)
     * @param convex whether the model has a reference minimiser (the metrics needing θ* are then numbers, else null)
     */
    public record Expected(String armId, String armName, int replicate, long rootSeed, Replicate.Seeds seeds,
            int parameters, int classes, int testRows, int updatesPerEpoch, long totalUpdates, boolean convex) {
    }

    // ------------------------------------------------------------------------------------------------ writing

    /** The JSON paths of the arrays the binary file holds, in the order written. */
    static final List<String> BLOCKS = List.of("rates", "start", "last", "tail_mean", "snapshots.values",
            "test_probabilities.values", "test_probabilities.classes");

    /**
     * A replicate's two files.
     *
     * @param json {@code <replicate>.json}: every field but the large arrays, and the binary file's length and checksum
     * @param binary {@code <replicate>.bin}: the large arrays ({@link ReplicateBlocks})
     */
    public record Written(byte[] json, byte[] binary) implements java.io.Serializable {
    }

    /** @return the replicate's two files' bytes; the binary file is written first, the JSON (which names it) last */
    public static Written write(Replicate r) {
        List<ReplicateBlocks.Block> blocks = new ArrayList<>();
        blocks.add(new ReplicateBlocks.Block("rates", 1, r.rates().length, Coding.FLOAT64_XOR, r.rates()));
        blocks.add(new ReplicateBlocks.Block("start", 1, r.start().length, Coding.FLOAT64, r.start()));
        blocks.add(new ReplicateBlocks.Block("last", 1, r.last().length, Coding.FLOAT64, r.last()));
        if (r.tailMean() != null) {
            blocks.add(new ReplicateBlocks.Block("tail_mean", 1, r.tailMean().length, Coding.FLOAT64, r.tailMean()));
        }
        if (r.tail() != null && r.snapshots() != null) {
            blocks.add(new ReplicateBlocks.Block("snapshots.values", r.snapshotRows(), r.last().length,
                    ReplicateBlocks.float32Unless(r.snapshots()), r.snapshots()));
        }
        if (r.tail() != null && r.testProbabilities() != null) {
            blocks.add(new ReplicateBlocks.Block("test_probabilities.values", r.testRows(), r.testClasses(),
                    Coding.FLOAT32, r.testProbabilities()));
            double[] classes = new double[r.testRows()];
            for (int i = 0; i < classes.length; i++) {
                classes[i] = r.testPredicted()[i];
            }
            blocks.add(new ReplicateBlocks.Block("test_probabilities.classes", classes.length, 1, Coding.INDEX,
                    classes));
        }
        byte[] binary = ReplicateBlocks.write(blocks);
        return new Written(JsonOut.document(g -> write(g, r, binary)), binary);
    }

    /**
     * Writes a replicate's two files, each atomically: the binary file first, then the JSON that records its length
     * and checksum, so that a JSON file on disk always names the binary file beside it.
     *
     * @param json where the JSON goes ({@code <replicate>.json}); the binary file goes beside it
     */
    public static void writeFiles(java.nio.file.Path json, Written files) throws IOException {
        AtomicFile.write(StudyFormat.binaryFileOf(json), files.binary());
        AtomicFile.write(json, files.json());
    }

    /**
     * Reads and checks a replicate's two files from disk ({@link #read(byte[], byte[], String, String, Expected)}).
     *
     * @param json the replicate's JSON file; its binary file is beside it
     */
    public static Replicate readFiles(java.nio.file.Path json, Expected expected) throws IOException {
        java.nio.file.Path binary = StudyFormat.binaryFileOf(json);
        byte[] jsonBytes = java.nio.file.Files.readAllBytes(json);
        byte[] binaryBytes = java.nio.file.Files.isRegularFile(binary) ? java.nio.file.Files.readAllBytes(binary)
                : null;
        return read(jsonBytes, binaryBytes, json.toString(), binary.toString(), expected);
    }

    private static void write(JsonGenerator g, Replicate r, byte[] binary) throws IOException {
        g.writeStartObject();
        g.writeNumberField("format", StudyFormat.VERSION);
        g.writeStringField("arm_id", r.armId());
        g.writeStringField("arm_name", r.armName());
        g.writeNumberField("replicate", r.replicate());
        g.writeObjectFieldStart("seeds");
        g.writeStringField("algorithm", r.seeds().algorithm());
        g.writeNumberField("root", r.seeds().root());
        g.writeNumberField("initialisation", r.seeds().initialisation());
        g.writeNumberField("sampling", r.seeds().sampling());
        g.writeEndObject();
        g.writeStringField("status", r.status());
        g.writeNumberField("diverged_at_update", r.divergedAtUpdate());
        g.writeNumberField("total_updates", r.totalUpdates());
        g.writeNumberField("updates_run", r.updatesRun());
        g.writeStringField("average", r.averageTail() ? "tail" : "none");
        JsonOut.number(g, "initial_objective", r.initialObjective());

        g.writeObjectFieldStart("metrics");
        for (Metric m : Metric.values()) {
            if (m == Metric.AVERAGED_GAP) {
                JsonOut.number(g, AVERAGED_OBJECTIVE, r.averagedObjective());
            }
            JsonOut.number(g, m.key(), r.metric(m));
        }
        g.writeEndObject();

        Replicate.Tail tail = r.tail();
        g.writeFieldName("tail");
        if (tail == null) {
            g.writeNull();
        } else {
            g.writeStartObject();
            g.writeNumberField("first_update", tail.firstUpdate());
            g.writeNumberField("length", tail.length());
            g.writeNumberField("epoch_ends", tail.epochEnds());
            g.writeNumberField("snapshots", tail.snapshots());
            JsonOut.array(g, "snapshot_updates", tail.snapshotUpdates());
            JsonOut.array(g, "snapshot_objectives", tail.snapshotObjectives());
            g.writeEndObject();
        }

        Replicate.Epochs e = r.epochs();
        g.writeObjectFieldStart("epochs");
        JsonOut.array(g, "epoch", wholes(e.epoch()));
        JsonOut.array(g, "last_update", wholes(e.lastUpdate()));
        JsonOut.array(g, "rate", e.rate());
        JsonOut.array(g, "objective", e.objective());
        JsonOut.array(g, "holdout_loss", e.holdoutLoss());
        JsonOut.array(g, "test_loss", e.testLoss());
        JsonOut.array(g, "test_accuracy", e.testAccuracy());
        JsonOut.array(g, "distance", e.distance());
        g.writeEndObject();

        g.writeArrayFieldStart("nudges");
        for (Nudge n : r.nudges()) {
            g.writeStartObject();
            g.writeNumberField("from_epoch", n.fromEpoch());
            g.writeNumberField("factor", n.factor());
            g.writeStringField("note", n.note());
            g.writeEndObject();
        }
        g.writeEndArray();
        g.writeArrayFieldStart("plateau_cuts");
        for (PlateauCut c : r.plateauCuts()) {
            g.writeStartObject();
            g.writeNumberField("from_epoch", c.fromEpoch());
            JsonOut.number(g, "rate", c.rate());
            g.writeEndObject();
        }
        g.writeEndArray();

        g.writeObjectFieldStart("binary");
        g.writeNumberField("bytes", binary.length);
        g.writeStringField("crc32c", ReplicateBlocks.checksum(binary));
        g.writeEndObject();
        if (r.tailMean() == null) {
            g.writeNullField("tail_mean");
        }
        int p = r.last().length;
        if (r.tail() == null) {
            g.writeNullField("snapshots");
            g.writeNullField("test_probabilities");
        } else {
            shape(g, "snapshots", r.snapshotRows(), p, r.snapshots());
            shape(g, "test_probabilities", r.testRows(), r.testClasses(), r.testProbabilities());
        }
        writePrediction(g, r.prediction());
        g.writeEndObject();
    }

    /** A matrix whose values are in the binary file: {@code "key": {rows, columns}}, or null for null values. */
    private static void shape(JsonGenerator g, String key, int rows, int columns, double[] values) throws IOException {
        g.writeFieldName(key);
        if (values == null) {
            g.writeNull();
            return;
        }
        g.writeStartObject();
        g.writeNumberField("rows", rows);
        g.writeNumberField("columns", columns);
        g.writeEndObject();
    }

    private static long[] wholes(double[] values) {
        long[] out = new long[values.length];
        for (int i = 0; i < values.length; i++) {
            out[i] = (long) values[i];
        }
        return out;
    }

    private static void writePrediction(JsonGenerator g, Prediction p) throws IOException {
        g.writeObjectFieldStart("prediction");
        g.writeBooleanField("predicted", p.predicted());
        if (!p.predicted()) {
            g.writeStringField("skipped", p.skipped());
            g.writeEndObject();
            return;
        }
        g.writeStringField("kind", p.kind());
        g.writeStringField("label", p.label());
        g.writeStringField("sampling", p.sampling());
        JsonOut.number(g, "momentum", p.momentum());
        JsonOut.number(g, "stability_bound", p.stabilityBound());
        JsonOut.number(g, "largest_rate_times_curvature", p.largestRateTimesCurvature());
        g.writeBooleanField("stable", p.stable());
        g.writeFieldName("unstable_from_update");
        if (p.stable()) {
            g.writeNull();
        } else {
            g.writeNumber(p.unstableFromUpdate());
        }
        JsonOut.number(g, "unstable_rate_times_curvature", p.unstableRateTimesCurvature());
        JsonOut.array(g, "epoch_distance_sq", p.epochDistanceSq());
        JsonOut.array(g, "epoch_excess_loss", p.epochExcessLoss());
        g.writeNumberField("tail_updates", p.tailUpdates());
        JsonOut.number(g, "tail_distance_sq", p.tailDistanceSq());
        g.writeNumberField("tail_epoch_ends", p.tailEpochEnds());
        JsonOut.number(g, "tail_distance_sq_epoch_ends", p.tailDistanceSqEpochEnds());
        JsonOut.number(g, "tail_excess_loss", p.tailExcessLoss());
        JsonOut.number(g, "final_distance_sq", p.finalDistanceSq());
        JsonOut.number(g, "final_excess_loss", p.finalExcessLoss());
        JsonOut.number(g, "final_bias_sq", p.finalBiasSq());
        JsonOut.number(g, "final_ball", p.finalBall());
        JsonOut.number(g, "tail_bias_sq", p.tailBiasSq());
        JsonOut.number(g, "tail_ball", p.tailBall());
        Prediction.FixedPoint f = p.fixedPoint();
        g.writeObjectFieldStart("fixed_point");
        JsonOut.number(g, "rate", f.rate());
        g.writeNumberField("batch", f.batch());
        g.writeBooleanField("exists", f.exists());
        JsonOut.number(g, "distance_sq", f.distanceSq());
        JsonOut.number(g, "distance_sq_epoch_end", f.distanceSqEpochEnd());
        JsonOut.number(g, "excess_loss", f.excessLoss());
        g.writeStringField("note", f.note());
        g.writeEndObject();
        g.writeEndObject();
    }

    // ------------------------------------------------------------------------------------------------ reading

    /**
     * Reads and checks a replicate's two files.
     *
     * @param bytes the JSON file's content
     * @param binary the binary file's content, or null when there is none
     * @param file the JSON file as messages name it
     * @param binaryFile the binary file as messages name it
     * @param expected what the study says it must hold
     * @return the replicate
     * @throws BadInputException naming the file and the field, for a file that is not this replicate's, not JSON, in
     *     another format, or with a field missing, of another type or out of its range
     */
    public static Replicate read(byte[] bytes, byte[] binary, String file, String binaryFile, Expected expected) {
        Obj r = JsonIn.read(bytes, file);
        int format = r.integer("format", Integer.MIN_VALUE, Integer.MAX_VALUE);
        if (format != StudyFormat.VERSION) {
            throw r.problem("format", "this file is in format " + format + "; this settle reads format "
                    + StudyFormat.VERSION);
        }
        String arm = r.text("arm_id");
        int replicate = r.integer("replicate", 1, Integer.MAX_VALUE);
        if (!arm.equals(expected.armId()) || replicate != expected.replicate()) {
            throw r.problem(!arm.equals(expected.armId()) ? "arm_id" : "replicate", "the file holds arm "
                    + BadInputException.shown(arm) + " replicate " + replicate + "; its path says arm "
                    + BadInputException.shown(expected.armId()) + " replicate " + expected.replicate());
        }
        String armName = r.text("arm_name");
        if (!armName.equals(expected.armName())) {
            throw r.problem("arm_name", "the file names arm " + BadInputException.shown(armName) + "; arm "
                    + BadInputException.shown(expected.armId()) + " of this study is "
                    + BadInputException.shown(expected.armName()));
        }
        placeBlocks(r, binary, binaryFile);
        Replicate.Seeds seeds = seeds(r.object("seeds"), expected);
        String status = r.choice("status", Replicate.FINISHED, Replicate.DIVERGED);
        boolean diverged = status.equals(Replicate.DIVERGED);
        int u = expected.updatesPerEpoch();
        long total = r.whole("total_updates", 1, Long.MAX_VALUE);
        if (expected.totalUpdates() > 0 && total != expected.totalUpdates()) {
            throw r.problem("total_updates", "is " + total + "; the study's training gives " + expected.totalUpdates()
                    + " updates (" + expected.totalUpdates() / u + " epochs of " + u + ")");
        }
        if (total % u != 0) {
            throw r.problem("total_updates", total + " is not a whole number of epochs of " + u + " updates");
        }
        long divergedAt = diverged ? r.whole("diverged_at_update", 1, total) : r.whole("diverged_at_update", 0, 0);
        long updatesRun = diverged ? r.whole("updates_run", divergedAt - 1, divergedAt)
                : r.whole("updates_run", total, total);
        boolean averageTail = r.choice("average", "none", "tail").equals("tail");
        double initialObjective = r.number("initial_objective", Range.NON_NEGATIVE);

        Obj m = r.object("metrics");
        double[] metrics = new double[Metric.values().length];
        Metric primary = expected.convex() ? Metric.FINAL_GAP : Metric.FINAL_OBJECTIVE;
        for (Metric metric : Metric.values()) {
            boolean required = !diverged && (metric == primary || metric == Metric.FINAL_OBJECTIVE);
            metrics[metric.ordinal()] = metric(m, metric.key(), metric.range(), required,
                    !metric.convexOnly() || expected.convex());
        }
        double averagedObjective = metric(m, AVERAGED_OBJECTIVE, Range.NON_NEGATIVE, false, true);

        int epochCount = (int) Math.min(Integer.MAX_VALUE, total / u);
        Replicate.Epochs epochs = epochs(r.object("epochs"), epochCount, u, diverged, expected.convex());
        if (diverged && (long) epochs.size() * u > updatesRun + u) {
            throw r.problem("epochs", "records " + epochs.size() + " epochs, more than the " + updatesRun
                    + " updates run make");
        }
        Replicate.Tail tail = diverged ? nullOr(r, "tail") : tail(r.object("tail"), total);
        List<Nudge> nudges = new ArrayList<>();
        for (Obj n : r.objects("nudges")) {
            nudges.add(new Nudge(n.integer("from_epoch", 1, Integer.MAX_VALUE), n.number("factor", Range.POSITIVE),
                    n.text("note")));
        }
        List<PlateauCut> cuts = new ArrayList<>();
        for (Obj c : r.objects("plateau_cuts")) {
            cuts.add(new PlateauCut(c.integer("from_epoch", 2, Integer.MAX_VALUE),
                    c.numberOrNull("rate", Range.NON_NEGATIVE)));
        }
        if (updatesRun > Integer.MAX_VALUE) {
            throw r.problem("updates_run", updatesRun + " updates are more than a replicate file holds");
        }
        double[] rates = r.numbers("rates", (int) updatesRun, Range.NON_NEGATIVE, false);
        int p = expected.parameters();
        double[] start = r.numbers("start", p, Range.ANY, false);
        double[] last = r.numbers("last", p, Range.ANY, diverged);
        double[] tailMean = diverged ? r.numbersOrNull("tail_mean", p, Range.ANY, true)
                : r.numbers("tail_mean", p, Range.ANY, false);

        int snapshotRows = 0;
        double[] snapshots = null;
        Obj s = diverged ? nullOr(r, "snapshots") : r.objectOrNull("snapshots");
        if (s != null) {
            snapshotRows = s.integer("rows", tail.snapshots(), tail.snapshots());
            s.integer("columns", p, p);
            snapshots = s.numbers("values", (int) Math.min(Integer.MAX_VALUE, (long) snapshotRows * p), Range.ANY,
                    true);
        }
        int classes = 0;
        double[] probabilities = null;
        int[] predicted = null;
        Obj t = diverged ? nullOr(r, "test_probabilities") : r.object("test_probabilities");
        if (t != null) {
            int rows = t.integer("rows", expected.testRows(), expected.testRows());
            classes = t.integer("columns", expected.classes(), expected.classes());
            probabilities = t.numbers("values", (int) Math.min(Integer.MAX_VALUE, (long) rows * classes), Range.UNIT,
                    false);
            double[] best = t.numbers("classes", rows, Range.NON_NEGATIVE, false);
            predicted = new int[rows];
            double tolerance = PROBABILITY_SUM_TOLERANCE * classes + FLOAT32_SUM_TOLERANCE;
            for (int i = 0; i < rows; i++) {
                double sum = 0;
                for (int k = 0; k < classes; k++) {
                    sum += probabilities[i * classes + k];
                }
                if (!(Math.abs(sum - 1) <= tolerance)) {
                    throw t.problem("values", "row " + (i + 1) + " sums to " + NumberText.shortest(sum)
                            + "; each row of class probabilities sums to 1");
                }
                predicted[i] = predictedClass(t, best[i], i, probabilities, classes);
            }
            if (rows == 0) {
                probabilities = null;
                predicted = null;
            }
        }
        Prediction prediction = prediction(r.object("prediction"), epochs.size());
        return new Replicate(arm, armName, replicate, seeds, status, divergedAt, total, updatesRun, averageTail,
                initialObjective, metrics, averagedObjective, tail, epochs, nudges, cuts, rates, start, last, tailMean,
                snapshotRows, snapshots, classes, probabilities, predicted, prediction);
    }

    /**
     * @return the predicted class of test row {@code row}: a class index whose stored probability is the row's largest
     *     (rounding to float32 keeps the order of the float64 values, ties aside, so the run's argmax is one of the
     *     stored row's largest)
     */
    private static int predictedClass(Obj t, double value, int row, double[] probabilities, int classes) {
        int c = (int) value;
        if (value != c || c >= classes) {
            throw t.problem("classes", "row " + (row + 1) + " predicts class " + NumberText.shortest(value)
                    + "; a class is an index from 0 to " + (classes - 1));
        }
        int base = row * classes;
        for (int k = 0; k < classes; k++) {
            if (probabilities[base + k] > probabilities[base + c]) {
                throw t.problem("classes", "row " + (row + 1) + " predicts class " + c + ", but class " + k
                        + " is more probable in test_probabilities.values; the predicted class is the most probable");
            }
        }
        return c;
    }

    /**
     * Checks the binary file against the length and checksum the JSON records, reads it, and puts each of its arrays
     * where the JSON would hold it, so that every array is then checked like the JSON's own.
     */
    private static void placeBlocks(Obj r, byte[] binary, String binaryFile) {
        Obj b = r.object("binary");
        long length = b.whole("bytes", 1, Integer.MAX_VALUE);
        String crc = b.text("crc32c");
        if (binary == null) {
            throw BadInputException.inFile(binaryFile, "", "missing; the replicate's JSON records a binary file of "
                    + length + " bytes beside it");
        }
        if (binary.length != length || !ReplicateBlocks.checksum(binary).equals(crc)) {
            throw BadInputException.inFile(binaryFile, "", "holds " + binary.length + " bytes with CRC-32C "
                    + ReplicateBlocks.checksum(binary) + "; the replicate's JSON records " + length + " bytes with "
                    + BadInputException.shown(crc) + " (the two files are not one replicate's)");
        }
        for (ReplicateBlocks.Block block : ReplicateBlocks.read(binary, binaryFile).values()) {
            if (!BLOCKS.contains(block.name())) {
                throw BadInputException.inFile(binaryFile, block.name(), "is not an array of a replicate; expected "
                        + String.join(", ", BLOCKS));
            }
            List<Coding> codings = codings(block.name());
            if (!codings.contains(block.coding())) {
                throw BadInputException.inFile(binaryFile, block.name(), "is in " + block.coding().word()
                        + "; this array is written in " + String.join(" or ", codings.stream().map(Coding::word)
                        .toList()));
            }
            int dot = block.name().indexOf('.');
            Obj into = r;
            String key = block.name();
            if (dot < 0 && block.rows() != 1) {
                throw BadInputException.inFile(binaryFile, block.name(), "is " + block.rows() + " × "
                        + block.columns() + "; a vector is written as 1 row");
            }
            if (dot > 0) {
                into = r.object(block.name().substring(0, dot));
                key = block.name().substring(dot + 1);
                int columns = key.equals("classes") ? 1 : into.integer("columns", 0, Integer.MAX_VALUE);
                if (into.integer("rows", 0, Integer.MAX_VALUE) != block.rows() || columns != block.columns()) {
                    throw BadInputException.inFile(binaryFile, block.name(), "is " + block.rows() + " × "
                            + block.columns() + "; the JSON's " + into.path + " is " + into.map.get("rows") + " × "
                            + columns);
                }
            }
            if (into.map.containsKey(key)) {
                throw BadInputException.inFile(r.file, block.name(), "is in the binary file as well as here; it is"
                        + " written in one place");
            }
            int firstNull = -1;
            double[] v = block.values();
            for (int i = 0; i < v.length && firstNull < 0; i++) {
                firstNull = Double.isNaN(v[i]) ? i : -1;
            }
            into.map.put(key, new JsonIn.NumberArray(v, firstNull));
        }
    }

    /**
     * @return the codings an array may be in: rates and θ vectors lossless, snapshots and test probabilities float32
     *     (float64 where a snapshot value lies beyond float32), predicted classes as indices
     */
    private static List<Coding> codings(String block) {
        return switch (block) {
            case "rates", "start", "last", "tail_mean" -> List.of(Coding.FLOAT64, Coding.FLOAT64_XOR);
            case "snapshots.values" -> List.of(Coding.FLOAT32, Coding.FLOAT64);
            case "test_probabilities.values" -> List.of(Coding.FLOAT32);
            default -> List.of(Coding.INDEX);
        };
    }

    /** @return null: the key must hold JSON null (a diverged replicate has no tail, snapshots or probabilities) */
    private static <T> T nullOr(Obj r, String key) {
        if (!r.isNull(key)) {
            throw r.bad(key, "null for a diverged replicate", r.raw(key));
        }
        return null;
    }

    private static Replicate.Seeds seeds(Obj s, Expected expected) {
        String algorithm = s.text("algorithm");
        long root = s.whole("root", expected.rootSeed(), expected.rootSeed());
        long initialisation = s.whole("initialisation", Long.MIN_VALUE, Long.MAX_VALUE);
        long sampling = s.whole("sampling", Long.MIN_VALUE, Long.MAX_VALUE);
        Replicate.Seeds seeds = new Replicate.Seeds(algorithm, root, initialisation, sampling);
        if (expected.seeds() != null && !expected.seeds().equals(seeds)) {
            throw s.problem("", "the file's seeds are not replicate " + expected.replicate() + "'s ("
                    + expected.seeds().algorithm() + ", initialisation " + expected.seeds().initialisation()
                    + ", sampling " + expected.seeds().sampling() + ")");
        }
        return seeds;
    }

    /**
     * @return a metric: a number in its range, or null ("not finite"); where it does not apply (it needs θ*), null.
     *     The verdict's metric of a finished replicate (its final objective, and its final gap with θ*) is always a
     *     number: a finished run ends at a finite objective.
     */
    private static double metric(Obj m, String key, Range range, boolean required, boolean applies) {
        if (!applies) {
            if (!m.isNull(key)) {
                throw m.bad(key, "null (it needs the reference minimiser θ*, which this study has not)", m.raw(key));
            }
            return Double.NaN;
        }
        return required ? m.number(key, range) : m.numberOrNull(key, range);
    }

    private static Replicate.Epochs epochs(Obj e, int planned, int updatesPerEpoch, boolean diverged, boolean convex) {
        double[] epoch = e.numbers("epoch", -1, Range.POSITIVE, false);
        int n = epoch.length;
        if (diverged ? n > planned : n != planned) {
            throw e.problem("epoch", "holds " + n + " epochs; expected " + (diverged ? "at most " : "") + planned);
        }
        double[] lastUpdate = e.numbers("last_update", n, Range.POSITIVE, false);
        for (int i = 0; i < n; i++) {
            if (epoch[i] != i + 1) {
                throw e.problem("epoch[" + i + "]", "is " + NumberText.shortest(epoch[i]) + "; epochs are numbered 1, 2,"
                        + " … in order");
            }
            if (lastUpdate[i] != (i + 1.0) * updatesPerEpoch) {
                throw e.problem("last_update[" + i + "]", "is " + NumberText.shortest(lastUpdate[i]) + "; epoch "
                        + (i + 1) + " ends at update " + (i + 1L) * updatesPerEpoch);
            }
        }
        return new Replicate.Epochs(epoch, lastUpdate, e.numbers("rate", n, Range.NON_NEGATIVE, diverged),
                e.numbers("objective", n, Range.NON_NEGATIVE, diverged),
                e.numbers("holdout_loss", n, Range.NON_NEGATIVE, true),
                e.numbers("test_loss", n, Range.NON_NEGATIVE, true),
                e.numbers("test_accuracy", n, Range.UNIT, true),
                convex ? e.numbers("distance", n, Range.NON_NEGATIVE, true) : nulls(e, "distance", n));
    }

    /** @return n NaN: the series must hold only null (it does not apply) */
    private static double[] nulls(Obj e, String key, int n) {
        double[] v = e.numbers(key, n, Range.ANY, true);
        for (int i = 0; i < n; i++) {
            if (!Double.isNaN(v[i])) {
                throw e.problem(key, "[" + i + "] is a number; without the reference minimiser θ* it is null");
            }
        }
        return v;
    }

    private static Replicate.Tail tail(Obj t, long total) {
        long length = t.whole("length", 1, total);
        long first = t.whole("first_update", total - length + 1, total - length + 1);
        int epochEnds = t.integer("epoch_ends", 1, Integer.MAX_VALUE);
        int snapshots = t.integer("snapshots", 1, (int) Math.min(Integer.MAX_VALUE, length));
        long[] updates = t.wholes("snapshot_updates", snapshots, first, total);
        for (int i = 1; i < snapshots; i++) {
            if (updates[i] <= updates[i - 1]) {
                throw t.problem("snapshot_updates[" + i + "]", "is " + updates[i] + ", not after the one before;"
                        + " snapshots are taken at increasing updates");
            }
        }
        if (updates[snapshots - 1] != total) {
            throw t.problem("snapshot_updates", "the last snapshot is at update " + updates[snapshots - 1]
                    + "; the last is taken at update " + total);
        }
        double[] objectives = t.numbers("snapshot_objectives", snapshots, Range.NON_NEGATIVE, false);
        return new Replicate.Tail(first, length, epochEnds, snapshots, updates, objectives);
    }

    private static Prediction prediction(Obj p, int epochs) {
        if (!p.bool("predicted")) {
            return Prediction.skipped(p.text("skipped"));
        }
        String kind = p.choice("kind", "exact", "first-order");
        boolean stable = p.bool("stable");
        long unstableFrom = stable ? 0 : p.whole("unstable_from_update", 1, Long.MAX_VALUE);
        if (stable && !p.isNull("unstable_from_update")) {
            throw p.bad("unstable_from_update", "null when the prediction is stable", p.raw("unstable_from_update"));
        }
        Obj f = p.object("fixed_point");
        Prediction.FixedPoint fixed = new Prediction.FixedPoint(f.numberOrNull("rate", Range.NON_NEGATIVE), f.integer("batch", 1,
                Integer.MAX_VALUE), f.bool("exists"), f.numberOrNull("distance_sq", Range.NON_NEGATIVE),
                f.numberOrNull("distance_sq_epoch_end", Range.NON_NEGATIVE), f.numberOrNull("excess_loss", Range.ANY),
                f.text("note"));
        return new Prediction(true, "", kind, p.text("label"), p.choice("sampling", "shuffle", "replacement"),
                p.number("momentum", Range.MOMENTUM), p.numberOrNull("stability_bound", Range.POSITIVE),
                p.numberOrNull("largest_rate_times_curvature", Range.NON_NEGATIVE), stable, unstableFrom,
                p.numberOrNull("unstable_rate_times_curvature", Range.NON_NEGATIVE),
                p.numbers("epoch_distance_sq", epochs, Range.NON_NEGATIVE, true),
                p.numbers("epoch_excess_loss", epochs, Range.ANY, true),
                p.integer("tail_updates", 1, Integer.MAX_VALUE), p.numberOrNull("tail_distance_sq", Range.NON_NEGATIVE),
                p.integer("tail_epoch_ends", 1, Integer.MAX_VALUE),
                p.numberOrNull("tail_distance_sq_epoch_ends", Range.NON_NEGATIVE),
                p.numberOrNull("tail_excess_loss", Range.ANY), p.numberOrNull("final_distance_sq", Range.NON_NEGATIVE),
                p.numberOrNull("final_excess_loss", Range.ANY), p.numberOrNull("final_bias_sq", Range.NON_NEGATIVE),
                p.numberOrNull("final_ball", Range.NON_NEGATIVE), p.numberOrNull("tail_bias_sq", Range.NON_NEGATIVE),
                p.numberOrNull("tail_ball", Range.NON_NEGATIVE), fixed);
    }
}
