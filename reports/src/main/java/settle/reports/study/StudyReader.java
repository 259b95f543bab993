package settle.reports.study;

import com.fasterxml.jackson.core.JsonLocation;
import com.fasterxml.jackson.core.JsonProcessingException;
import com.fasterxml.jackson.databind.JsonNode;
import com.fasterxml.jackson.core.StreamReadFeature;
import com.fasterxml.jackson.databind.ObjectMapper;
import com.fasterxml.jackson.databind.json.JsonMapper;
import java.io.IOException;
import java.nio.charset.StandardCharsets;
import java.nio.file.Files;
import java.nio.file.NoSuchFileException;
import java.nio.file.Path;
import java.util.ArrayList;
import java.util.Iterator;
import java.util.List;

/**
 * Reads a study directory through its documented format (version 1: {@code manifest.json}, {@code plan.yaml},
 * {@code reference.json}, {@code arms/<arm>/<replicate>.json}). A missing or malformed directory or file gives
 * a {@link StudyFormatException} with a one-line message naming the file and key; a missing replicate file
 * is not an error (the study is partial and its slot is null).
 */
public final class StudyReader {

    /** The study directory format this reader understands. */
    public static final int FORMAT = 1;

    private static final ObjectMapper MAPPER = JsonMapper.builder()
            .enable(StreamReadFeature.USE_FAST_DOUBLE_PARSER).build();

    private StudyReader() {
    }

    /**
     * @param directory the study directory
     * @return the study
     * @throws StudyFormatException for a missing or malformed study directory
     * @throws IOException when a file exists but cannot be read
     */
    public static Study read(Path directory) throws IOException {
        if (!Files.isDirectory(directory)) {
            throw new StudyFormatException(directory + ": no such study directory");
        }
        Path manifestFile = directory.resolve("manifest.json");
        if (!Files.isRegularFile(manifestFile)) {
            throw new StudyFormatException(directory + ": not a study directory (no manifest.json; "
                    + "a study directory is made by settle run)");
        }
        JsonNode m = parse(manifestFile);
        Manifest manifest = manifest(manifestFile, m);
        Path planFile = directory.resolve("plan.yaml");
        String planText;
        try {
            planText = Files.readString(planFile, StandardCharsets.UTF_8);
        } catch (NoSuchFileException e) {
            throw new StudyFormatException(planFile + ": missing; every study directory has its resolved plan");
        }
        Path referenceFile = directory.resolve("reference.json");
        Reference reference = Files.isRegularFile(referenceFile) ? reference(referenceFile, parse(referenceFile)) : null;
        int arms = manifest.arms().size();
        int count = manifest.replicates();
        Replicate[] files = new Replicate[arms * count];
        // Files are independent: read them in parallel; each lands in its own slot, so order is fixed.
        try {
            java.util.stream.IntStream.range(0, files.length).parallel().forEach(i -> {
                int a = i / count + 1;
                int k = i % count + 1;
                Path file = directory.resolve("arms").resolve(Integer.toString(a)).resolve(k + ".json");
                if (Files.isRegularFile(file)) {
                    try {
                        files[i] = replicate(file, parse(file), a, k, manifest);
                    } catch (IOException e) {
                        throw new java.io.UncheckedIOException(e);
                    }
                }
            });
        } catch (java.io.UncheckedIOException e) {
            throw e.getCause();
        }
        List<List<Replicate>> replicates = new ArrayList<>();
        for (int a = 0; a < arms; a++) {
            replicates.add(java.util.Arrays.asList(java.util.Arrays.copyOfRange(files, a * count, (a + 1) * count)));
        }
        return new Study(directory, manifest, planText, reference, replicates);
    }

    private static JsonNode parse(Path file) throws IOException {
        try {
            JsonNode node = MAPPER.readTree(file.toFile());
            if (node == null || !node.isObject()) {
                throw new StudyFormatException(file + ": expected a JSON object");
            }
            return node;
        } catch (JsonProcessingException e) {
            JsonLocation at = e.getLocation();
            String where = at == null ? "" : " at line " + at.getLineNr() + ", column " + at.getColumnNr();
            throw new StudyFormatException(file + ": not valid JSON" + where + ": " + e.getOriginalMessage());
        }
    }

    private static Manifest manifest(Path file, JsonNode m) {
        int format = integer(file, m, "format");
        if (format != FORMAT) {
            throw new StudyFormatException(file + ": study directory format " + format
                    + " is not supported; this settle reads format " + FORMAT);
        }
        JsonNode tool = object(file, m, "tool");
        JsonNode jvm = m.path("jvm");
        JsonNode cpu = m.path("cpu");
        JsonNode data = object(file, m, "data");
        List<String> arms = new ArrayList<>();
        JsonNode armList = array(file, m, "arms");
        for (int i = 0; i < armList.size(); i++) {
            JsonNode arm = armList.get(i);
            int index = integer(file, arm, "index");
            if (index != i + 1) {
                throw new StudyFormatException(file + ": arms[" + i + "].index is " + index + "; expected " + (i + 1)
                        + " (arms are listed in index order from 1)");
            }
            arms.add(text(file, arm, "name"));
        }
        int replicates = 0;
        for (JsonNode r : array(file, m, "replicates")) {
            int arm = integer(file, r, "arm");
            if (arm < 1 || arm > arms.size()) {
                throw new StudyFormatException(file + ": replicates lists arm " + arm + "; the study has arms 1 to "
                        + arms.size());
            }
            replicates = Math.max(replicates, integer(file, r, "replicate"));
        }
        if (replicates < 1) {
            throw new StudyFormatException(file + ": 'replicates' lists no replicate");
        }
        return new Manifest(format, text(file, tool, "version"), tool.path("git_commit").asText(""),
                join(jvm.path("vendor").asText(""), jvm.path("name").asText(""), jvm.path("version").asText("")),
                join(cpu.path("model").asText(""), cpu.path("arch").asText(""),
                        cpu.has("cores") ? cpu.path("cores").asInt() + " cores" : ""),
                m.path("executor").asText(""), m.path("threads").asInt(0), strings(file, m, "command"),
                m.path("generator").asText(""), m.path("root_seed").asLong(), m.path("started").asText(""),
                m.path("ended").isNull() ? "" : m.path("ended").asText(""), m.path("plan_sha256").asText(""),
                m.path("data_sha256").asText(""), m.path("split_sha256").asText(""), text(file, data, "source"),
                data.path("rows").asInt(), strings(file, data, "feature_names"), strings(file, data, "class_names"),
                data.path("train_rows").asInt(), integer(file, data, "test_rows"),
                integer(file, data, "updates_per_epoch"), text(file, m, "model"), integer(file, m, "parameters"),
                text(file, m, "baseline"), arms, replicates);
    }

    private static String join(String... parts) {
        StringBuilder b = new StringBuilder();
        for (String p : parts) {
            if (!p.isEmpty()) {
                b.append(b.length() == 0 ? "" : ", ").append(p);
            }
        }
        return b.toString();
    }

    private static Reference reference(Path file, JsonNode r) {
        int format = integer(file, r, "format");
        if (format != FORMAT) {
            throw new StudyFormatException(file + ": format " + format + " is not supported; expected " + FORMAT);
        }
        double[] theta = numbers(file, r, "theta", false);
        double[] eigen = r.has("eigenvalues") ? numbers(file, r, "eigenvalues", false) : null;
        return new Reference(theta, number(file, r, "objective"), r.path("gradient_norm").asDouble(Double.NaN),
                r.path("method").asText(""), eigen, r.path("stability_bound").isNumber()
                        ? r.path("stability_bound").asDouble() : Double.NaN,
                r.has("gauge_dimension") ? integer(file, r, "gauge_dimension") : -1);
    }

    private static Replicate replicate(Path file, JsonNode r, int arm, int k, Manifest manifest) {
        int format = integer(file, r, "format");
        if (format != FORMAT) {
            throw new StudyFormatException(file + ": format " + format + " is not supported; expected " + FORMAT);
        }
        if (integer(file, r, "arm") != arm || integer(file, r, "replicate") != k) {
            throw new StudyFormatException(file + ": holds arm " + r.path("arm").asInt() + " replicate "
                    + r.path("replicate").asInt() + "; its path says arm " + arm + " replicate " + k);
        }
        String status = text(file, r, "status");
        if (!status.equals("finished") && !status.equals("diverged")) {
            throw new StudyFormatException(file + ": status '" + status + "'; expected finished or diverged");
        }
        JsonNode seeds = object(file, r, "seeds");
        JsonNode metricsNode = r.path("metrics");
        double[] metrics = new double[Metric.values().length];
        for (Metric metric : Metric.values()) {
            JsonNode v = metricsNode.path(metric.key());
            metrics[metric.ordinal()] = v.isNumber() ? v.asDouble() : Double.NaN;
        }
        JsonNode e = object(file, r, "epochs");
        Replicate.Epochs epochs = new Replicate.Epochs(numbers(file, e, "epoch", true),
                numbers(file, e, "last_update", true), numbers(file, e, "rate", true),
                numbers(file, e, "objective", true), numbers(file, e, "test_loss", true),
                numbers(file, e, "test_accuracy", true), numbers(file, e, "distance", true));
        int n = epochs.size();
        for (double[] series : new double[][] {epochs.lastUpdate(), epochs.rate(), epochs.objective(),
            epochs.testLoss(), epochs.testAccuracy(), epochs.distance()}) {
            if (series.length != n) {
                throw new StudyFormatException(file + ": the 'epochs' series differ in length; each has one value per"
                        + " epoch");
            }
        }
        double[] last = numbers(file, r, "last", true);
        if (last.length != manifest.parameters()) {
            throw new StudyFormatException(file + ": 'last' has " + last.length + " values; the model has "
                    + manifest.parameters() + " parameters");
        }
        double[] tailMean = r.path("tail_mean").isArray() ? numbers(file, r, "tail_mean", true) : null;
        JsonNode snap = r.path("snapshots");
        int snapshotRows = 0;
        double[] snapshots = null;
        if (snap.isObject()) {
            snapshotRows = integer(file, snap, "rows");
            snapshots = numbers(file, snap, "values", false);
            if (snapshotRows > 0 && snapshots.length != (long) snapshotRows * last.length) {
                throw new StudyFormatException(file + ": 'snapshots' has " + snapshots.length + " values for "
                        + snapshotRows + " rows of " + last.length + " parameters");
            }
            if (snapshotRows == 0) {
                snapshots = null;
            }
        }
        JsonNode probs = r.path("test_probabilities");
        double[] probabilities = null;
        int classes = 0;
        if (probs.isObject()) {
            int rows = integer(file, probs, "rows");
            classes = integer(file, probs, "columns");
            probabilities = numbers(file, probs, "values", false);
            if (probabilities.length != (long) rows * classes) {
                throw new StudyFormatException(file + ": 'test_probabilities' has " + probabilities.length
                        + " values for " + rows + " rows of " + classes + " classes");
            }
            if (rows == 0) {
                probabilities = null;
            }
        }
        return new Replicate(arm, text(file, r, "arm_name"), k, seeds.path("initialisation").asLong(),
                seeds.path("sampling").asLong(), status, r.path("diverged_at_update").asLong(0),
                r.path("total_updates").asLong(0), "tail".equals(r.path("average").asText("none")),
                r.path("initial_objective").asDouble(Double.NaN), metrics, epochs,
                numbers(file, r, "rates", true), last, tailMean, snapshotRows, snapshots, classes, probabilities,
                prediction(file, r.path("prediction")));
    }

    private static Prediction prediction(Path file, JsonNode p) {
        if (!p.isObject() || !p.path("predicted").asBoolean(false)) {
            String reason = p.isObject() ? p.path("skipped").asText("not recorded") : "not recorded";
            return new Prediction(false, reason, "", "", null, Double.NaN, Double.NaN, Double.NaN);
        }
        return new Prediction(true, "", p.path("kind").asText(""), p.path("label").asText(""),
                numbers(file, p, "epoch_distance_sq", true), p.path("tail_distance_sq").asDouble(Double.NaN),
                p.path("stability_bound").asDouble(Double.NaN),
                p.path("largest_rate_times_curvature").asDouble(Double.NaN));
    }

    private static JsonNode field(Path file, JsonNode node, String key) {
        JsonNode v = node.get(key);
        if (v == null || v.isMissingNode()) {
            throw new StudyFormatException(file + ": missing key '" + key + "'");
        }
        return v;
    }

    private static int integer(Path file, JsonNode node, String key) {
        JsonNode v = field(file, node, key);
        if (!v.isIntegralNumber() || !v.canConvertToInt()) {
            throw new StudyFormatException(file + ": '" + key + "' must be a whole number, not " + v);
        }
        return v.asInt();
    }

    private static double number(Path file, JsonNode node, String key) {
        JsonNode v = field(file, node, key);
        if (!v.isNumber()) {
            throw new StudyFormatException(file + ": '" + key + "' must be a number, not " + v);
        }
        return v.asDouble();
    }

    private static String text(Path file, JsonNode node, String key) {
        JsonNode v = field(file, node, key);
        if (!v.isTextual()) {
            throw new StudyFormatException(file + ": '" + key + "' must be a string, not " + v);
        }
        return v.asText();
    }

    private static JsonNode object(Path file, JsonNode node, String key) {
        JsonNode v = field(file, node, key);
        if (!v.isObject()) {
            throw new StudyFormatException(file + ": '" + key + "' must be an object");
        }
        return v;
    }

    private static JsonNode array(Path file, JsonNode node, String key) {
        JsonNode v = field(file, node, key);
        if (!v.isArray()) {
            throw new StudyFormatException(file + ": '" + key + "' must be an array");
        }
        return v;
    }

    private static List<String> strings(Path file, JsonNode node, String key) {
        JsonNode a = array(file, node, key);
        List<String> out = new ArrayList<>(a.size());
        for (Iterator<JsonNode> it = a.elements(); it.hasNext();) {
            out.add(it.next().asText());
        }
        return out;
    }

    /** @return the array's numbers; null entries become NaN when {@code nullable}, else are an error */
    private static double[] numbers(Path file, JsonNode node, String key, boolean nullable) {
        JsonNode a = array(file, node, key);
        double[] out = new double[a.size()];
        for (int i = 0; i < out.length; i++) {
            JsonNode v = a.get(i);
            if (v.isNumber()) {
                out[i] = v.asDouble();
            } else if (v.isNull() && nullable) {
                out[i] = Double.NaN;
            } else {
                throw new StudyFormatException(file + ": '" + key + "'[" + i + "] must be a number, not " + v);
            }
        }
        return out;
    }
}
