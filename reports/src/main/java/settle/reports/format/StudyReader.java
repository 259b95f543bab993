package settle.reports.format;

import com.fasterxml.jackson.core.JsonLocation;
import com.fasterxml.jackson.core.JsonProcessingException;
import java.io.IOException;
import java.nio.charset.StandardCharsets;
import java.nio.file.Files;
import java.nio.file.NoSuchFileException;
import java.nio.file.Path;
import java.util.ArrayList;
import java.util.List;
import java.util.Map;
import java.util.Set;

/**
 * Reads a study directory through its documented format (version 2: {@code manifest.json}, {@code plan.yaml},
 * {@code reference.json}, {@code arms/<arm>/<replicate>.json}). A missing or malformed directory or file gives
 * a {@link StudyFormatException} with a one-line message naming the file and key; a missing replicate file
 * is not an error (the study is partial and its slot is null). A directory in format 1 is refused with
 * {@link #olderFormat}: its tail metrics and reshuffling prediction mean something else, so none of its numbers is
 * shown beside format 2's. Keys of format 2 that a file leaves out read as null ("does not apply").
 */
public final class StudyReader {

    /** The study directory format this reader understands. */
    public static final int FORMAT = 2;

    /** The header of {@code nudges.csv}. */
    public static final String NUDGES_HEADER = "arm_index,arm,from_epoch,factor,rate,note,time,request";

    /** Keys of a replicate file the report does not read: skipped unparsed. */
    private static final Set<String> REPLICATE_SKIP = Set.of("holdout_loss", "start", "epoch_excess_loss",
            "snapshot_updates", "snapshot_objectives");
    /** Keys of the manifest the report does not read. */
    private static final Set<String> MANIFEST_SKIP = Set.of("standardisation");

    private StudyReader() {
    }

    /**
     * The one-line refusal of a file written in format 1 (or any older format): its tail radius and distance came
     * from the snapshots and its reshuffling prediction was approximate, so its numbers cannot stand beside format 2's.
     *
     * @param file the manifest (or the file) in the older format
     * @param format the format it records
     * @param rerun the command that rewrites the study, e.g. {@code settle run plan.yaml --out DIR --fresh}
     * @return the message
     */
    public static String olderFormat(Path file, int format, String rerun) {
        String what = file.getFileName() != null && file.getFileName().toString().equals("manifest.json")
                ? "this study directory" : "this file";
        return file + ": " + what + " is in format " + format + ", written by an earlier settle whose tail metrics came"
                + " from snapshots and whose reshuffling prediction was approximate; rerun it with `" + rerun
                + "` to rewrite it in format " + FORMAT;
    }

    /** @return the command that rewrites a study directory from its own plan */
    static String rerun(Path directory) {
        return "settle run " + directory.resolve("plan.yaml") + " --out " + directory + " --fresh";
    }

    /** Refuses a file whose format is not {@link #FORMAT}: an older one with {@link #olderFormat}. */
    private static void checkFormat(Path file, Map<String, Object> node, Path directory) {
        int format = integer(file, node, "format");
        if (format < FORMAT) {
            throw new StudyFormatException(olderFormat(file, format, rerun(directory)));
        }
        if (format != FORMAT) {
            throw new StudyFormatException(file + ": study directory format " + format
                    + " is not supported; this settle reads format " + FORMAT);
        }
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
        Map<String, Object> m = parse(manifestFile, MANIFEST_SKIP);
        checkFormat(manifestFile, m, directory);
        Manifest manifest = manifest(manifestFile, m);
        Path planFile = directory.resolve("plan.yaml");
        String planText;
        try {
            planText = Files.readString(planFile, StandardCharsets.UTF_8);
        } catch (NoSuchFileException e) {
            throw new StudyFormatException(planFile + ": missing; every study directory has its resolved plan");
        }
        Path referenceFile = directory.resolve("reference.json");
        Reference reference = Files.isRegularFile(referenceFile)
                ? reference(referenceFile, parse(referenceFile, Set.of()), directory) : null;
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
                        files[i] = replicate(file, parse(file, REPLICATE_SKIP), a, k, manifest, directory);
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
        return new Study(directory, manifest, planText, reference, replicates, nudgesCsv(directory.resolve("nudges.csv")));
    }

    private static Map<String, Object> parse(Path file, Set<String> skip) throws IOException {
        try {
            Object node = LeanJson.read(file, skip);
            if (!(node instanceof Map)) {
                throw new StudyFormatException(file + ": expected a JSON object");
            }
            return cast(node);
        } catch (JsonProcessingException e) {
            JsonLocation at = e.getLocation();
            String where = at == null ? "" : " at line " + at.getLineNr() + ", column " + at.getColumnNr();
            throw new StudyFormatException(file + ": not valid JSON" + where + ": " + e.getOriginalMessage());
        }
    }

    private static Manifest manifest(Path file, Map<String, Object> m) {
        int format = integer(file, m, "format");
        Map<String, Object> tool = object(file, m, "tool");
        Map<String, Object> jvm = optionalObject(m, "jvm");
        Map<String, Object> cpu = optionalObject(m, "cpu");
        Map<String, Object> data = object(file, m, "data");
        List<String> arms = new ArrayList<>();
        List<Object> armList = array(file, m, "arms");
        for (int i = 0; i < armList.size(); i++) {
            Map<String, Object> arm = element(file, armList, i, "arms");
            int index = integer(file, arm, "index");
            if (index != i + 1) {
                throw new StudyFormatException(file + ": arms[" + i + "].index is " + index + "; expected " + (i + 1)
                        + " (arms are listed in index order from 1)");
            }
            arms.add(text(file, arm, "name"));
        }
        int replicates = 0;
        List<Object> replicateList = array(file, m, "replicates");
        for (int i = 0; i < replicateList.size(); i++) {
            Map<String, Object> r = element(file, replicateList, i, "replicates");
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
        Object studyName = recorded(file, m, "study");
        if (!(studyName instanceof String name) || name.isBlank()) {
            throw new StudyFormatException(file + ": 'study' must be the study's name, not " + show(studyName));
        }
        Object l2 = recorded(file, m, "model_l2");
        if (!isNumber(l2) || !(((Number) l2).doubleValue() >= 0) || Double.isInfinite(((Number) l2).doubleValue())) {
            throw new StudyFormatException(file + ": 'model_l2' must be the model's penalty λ, a number ≥ 0, not "
                    + show(l2));
        }
        recorded(file, m, "grid");
        List<Grid> grids = grids(file, array(file, m, "grid"), arms.size());
        return new Manifest(format, name, text(file, tool, "version"), asText(tool.get("git_commit"), ""),
                join(asText(jvm.get("vendor"), ""), asText(jvm.get("name"), ""), asText(jvm.get("version"), "")),
                join(asText(cpu.get("model"), ""), asText(cpu.get("arch"), ""),
                        cpu.containsKey("cores") ? asLong(cpu.get("cores"), 0) + " cores" : ""),
                asText(m.get("executor"), ""), (int) asLong(m.get("threads"), 0), strings(file, m, "command"),
                asText(m.get("generator"), ""), asLong(m.get("root_seed"), 0), asText(m.get("started"), ""),
                asText(m.get("ended"), ""), asText(m.get("plan_sha256"), ""),
                asText(m.get("data_sha256"), ""), asText(m.get("split_sha256"), ""), text(file, data, "source"),
                (int) asLong(data.get("rows"), 0), strings(file, data, "feature_names"),
                strings(file, data, "class_names"), (int) asLong(data.get("train_rows"), 0),
                integer(file, data, "test_rows"), integer(file, data, "updates_per_epoch"), text(file, m, "model"),
                integer(file, m, "parameters"), ((Number) l2).doubleValue(), text(file, m, "baseline"), arms, grids,
                replicates);
    }

    /**
     * @return the value of a key the manifest records for the report since the study's name, λ and grid were added to
     *     format 2; a manifest written before then is refused with one line saying how to rewrite it
     */
    private static Object recorded(Path file, Map<String, Object> m, String key) {
        Object v = m.get(key);
        if (v == null) {
            Path directory = file.toAbsolutePath().getParent();
            throw new StudyFormatException(file + ": missing key '" + key + "' (the manifest records the study's name,"
                    + " model_l2 and grid for the report since this settle); run the study's plan again with settle run"
                    + " PLAN --out " + directory + " to rewrite it: its finished replicates are kept");
        }
        return v;
    }

    /**
     * The manifest's {@code grid}: per grid entry of the plan, {@code arm} (the template's name), {@code keys}
     * [{@code name}, {@code values} [strings]] and {@code arms} [{@code index} (from 1), {@code values} [one string per
     * key, each one of that key's values]]; an arm belongs to at most one entry.
     */
    private static List<Grid> grids(Path file, List<Object> list, int armCount) {
        List<Grid> out = new ArrayList<>();
        boolean[] taken = new boolean[armCount];
        for (int i = 0; i < list.size(); i++) {
            String at = "grid[" + i + "]";
            Map<String, Object> g = element(file, list, i, "grid");
            String arm = textAt(file, g, "arm", at);
            List<Object> keyList = array(file, g, "keys");
            if (keyList.isEmpty()) {
                throw new StudyFormatException(file + ": " + at + ".keys is empty; a grid sweeps at least one key");
            }
            List<String> keys = new ArrayList<>();
            List<List<String>> values = new ArrayList<>();
            for (int k = 0; k < keyList.size(); k++) {
                Map<String, Object> key = element(file, keyList, k, at + ".keys");
                keys.add(textAt(file, key, "name", at + ".keys[" + k + "]"));
                List<String> written = textsAt(file, key, "values", at + ".keys[" + k + "]");
                if (written.isEmpty()) {
                    throw new StudyFormatException(file + ": " + at + ".keys[" + k + "].values is empty; a swept key "
                            + "has at least one value");
                }
                values.add(written);
            }
            List<Object> armList = array(file, g, "arms");
            if (armList.isEmpty()) {
                throw new StudyFormatException(file + ": " + at + ".arms is empty; a grid expands into at least one arm");
            }
            List<Grid.Member> members = new ArrayList<>();
            for (int j = 0; j < armList.size(); j++) {
                String where = at + ".arms[" + j + "]";
                Map<String, Object> member = element(file, armList, j, at + ".arms");
                int index = integer(file, member, "index");
                if (index < 1 || index > armCount) {
                    throw new StudyFormatException(file + ": " + where + ".index is " + index + "; the study has arms 1 to "
                            + armCount);
                }
                if (taken[index - 1]) {
                    throw new StudyFormatException(file + ": " + where + ".index " + index + " is already listed by a "
                            + "grid; an arm comes from at most one grid entry");
                }
                taken[index - 1] = true;
                List<String> chosen = textsAt(file, member, "values", where);
                if (chosen.size() != keys.size()) {
                    throw new StudyFormatException(file + ": " + where + ".values has " + chosen.size() + " values; "
                            + at + " sweeps " + keys.size() + " keys");
                }
                for (int k = 0; k < keys.size(); k++) {
                    if (!values.get(k).contains(chosen.get(k))) {
                        throw new StudyFormatException(file + ": " + where + ".values[" + k + "] is " + show(chosen.get(k))
                                + ", not one of the values of '" + keys.get(k) + "'");
                    }
                }
                members.add(new Grid.Member(index - 1, chosen));
            }
            out.add(new Grid(arm, keys, values, members));
        }
        return out;
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

    private static Reference reference(Path file, Map<String, Object> r, Path directory) {
        checkFormat(file, r, directory);
        double[] theta = numbers(file, r, "theta", false);
        double[] eigen = r.containsKey("eigenvalues") ? numbers(file, r, "eigenvalues", false) : null;
        Object stability = r.get("stability_bound");
        return new Reference(theta, number(file, r, "objective"), asDouble(r.get("gradient_norm"), Double.NaN),
                asText(r.get("method"), ""), eigen, isNumber(stability) ? asDouble(stability, Double.NaN) : Double.NaN,
                r.containsKey("gauge_dimension") ? integer(file, r, "gauge_dimension") : -1, bound(file, r));
    }

    /** The {@code last_iterate_bound} block of reference.json, or null when the file has none. */
    private static Bound bound(Path file, Map<String, Object> r) {
        if (!r.containsKey("last_iterate_bound")) {
            return null;
        }
        Map<String, Object> b = object(file, r, "last_iterate_bound");
        String source = asText(b.get("source"), "");
        if (b.containsKey("skipped")) {
            return new Bound(source, Double.NaN, Double.NaN, new double[0], text(file, b, "skipped"));
        }
        List<Object> arms = array(file, b, "arms");
        double[] values = new double[arms.size()];
        for (int i = 0; i < values.length; i++) {
            Map<String, Object> arm = element(file, arms, i, "last_iterate_bound.arms");
            if (integer(file, arm, "index") != i + 1) {
                throw new StudyFormatException(file + ": last_iterate_bound.arms[" + i + "].index is "
                        + arm.get("index") + "; expected " + (i + 1) + " (arms in index order from 1)");
            }
            values[i] = number(file, arm, "value");
        }
        String skipped = "";
        if (values.length == 0) {
            skipped = "no arm has a value";
        }
        return new Bound(source, number(file, b, "d"), number(file, b, "g"), values, skipped);
    }

    private static Replicate replicate(Path file, Map<String, Object> r, int arm, int k, Manifest manifest,
            Path directory) {
        checkFormat(file, r, directory);
        if (integer(file, r, "arm") != arm || integer(file, r, "replicate") != k) {
            throw new StudyFormatException(file + ": holds arm " + asLong(r.get("arm"), 0) + " replicate "
                    + asLong(r.get("replicate"), 0) + "; its path says arm " + arm + " replicate " + k);
        }
        String status = text(file, r, "status");
        if (!status.equals("finished") && !status.equals("diverged")) {
            throw new StudyFormatException(file + ": status '" + status + "'; expected finished or diverged");
        }
        Map<String, Object> seeds = object(file, r, "seeds");
        Map<String, Object> metricsNode = optionalObject(r, "metrics");
        double[] metrics = new double[Metric.values().length];
        for (Metric metric : Metric.values()) {
            metrics[metric.ordinal()] = asDouble(metricsNode.get(metric.key()), Double.NaN);
        }
        Map<String, Object> e = object(file, r, "epochs");
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
        double[] tailMean = r.get("tail_mean") instanceof LeanJson.Numbers ? numbers(file, r, "tail_mean", true) : null;
        Object snap = r.get("snapshots");
        int snapshotRows = 0;
        double[] snapshots = null;
        if (snap instanceof Map) {
            Map<String, Object> s = cast(snap);
            snapshotRows = integer(file, s, "rows");
            snapshots = numbers(file, s, "values", true);
            if (snapshotRows > 0 && snapshots.length != (long) snapshotRows * last.length) {
                throw new StudyFormatException(file + ": 'snapshots' has " + snapshots.length + " values for "
                        + snapshotRows + " rows of " + last.length + " parameters");
            }
            if (snapshotRows == 0) {
                snapshots = null;
            }
        }
        Object probs = r.get("test_probabilities");
        double[] probabilities = null;
        int classes = 0;
        if (probs instanceof Map) {
            Map<String, Object> s = cast(probs);
            int rows = integer(file, s, "rows");
            classes = integer(file, s, "columns");
            probabilities = numbers(file, s, "values", false);
            if (probabilities.length != (long) rows * classes) {
                throw new StudyFormatException(file + ": 'test_probabilities' has " + probabilities.length
                        + " values for " + rows + " rows of " + classes + " classes");
            }
            if (rows == 0) {
                probabilities = null;
            }
        }
        double[] rates = numbers(file, r, "rates", true);
        return new Replicate(arm, text(file, r, "arm_name"), k, asLong(seeds.get("initialisation"), 0),
                asLong(seeds.get("sampling"), 0), status, asLong(r.get("diverged_at_update"), 0),
                asLong(r.get("total_updates"), 0), "tail".equals(asText(r.get("average"), "none")),
                asDouble(r.get("initial_objective"), Double.NaN), tail(r.get("tail")), metrics, epochs, rates, last,
                tailMean, snapshotRows, snapshots, classes, probabilities,
                prediction(file, r.get("prediction")), nudges(file, r),
                plateauCuts(file, r));
    }

    /** The replicate's {@code nudges}; a file written before they were recorded has none. */
    private static List<Nudge> nudges(Path file, Map<String, Object> r) {
        List<Nudge> out = new ArrayList<>();
        if (!r.containsKey("nudges")) {
            return out;
        }
        List<Object> list = array(file, r, "nudges");
        for (int i = 0; i < list.size(); i++) {
            Map<String, Object> n = element(file, list, i, "nudges");
            double factor = number(file, n, "factor");
            if (!(factor > 0) || Double.isInfinite(factor)) {
                throw new StudyFormatException(file + ": nudges[" + i + "].factor is " + factor
                        + "; a nudge's factor is positive and finite");
            }
            out.add(new Nudge(epoch(file, n, "nudges", i), factor, text(file, n, "note")));
        }
        return out;
    }

    /** The replicate's {@code plateau_cuts}; a file written before they were recorded has none. */
    private static List<PlateauCut> plateauCuts(Path file, Map<String, Object> r) {
        List<PlateauCut> out = new ArrayList<>();
        if (!r.containsKey("plateau_cuts")) {
            return out;
        }
        List<Object> list = array(file, r, "plateau_cuts");
        for (int i = 0; i < list.size(); i++) {
            Map<String, Object> c = element(file, list, i, "plateau_cuts");
            Object rate = c.get("rate");
            out.add(new PlateauCut(epoch(file, c, "plateau_cuts", i), isNumber(rate) ? asDouble(rate, Double.NaN)
                    : Double.NaN));
        }
        return out;
    }

    private static int epoch(Path file, Map<String, Object> node, String list, int i) {
        int e = integer(file, node, "from_epoch");
        if (e < 1) {
            throw new StudyFormatException(file + ": " + list + "[" + i + "].from_epoch is " + e
                    + "; epochs count from 1");
        }
        return e;
    }

    /** The replicate file's {@code tail}, or null when it has none (a diverged replicate). */
    private static Replicate.Tail tail(Object node) {
        if (!(node instanceof Map)) {
            return null;
        }
        Map<String, Object> t = cast(node);
        return new Replicate.Tail(asLong(t.get("first_update"), 0), asLong(t.get("length"), 0),
                (int) asLong(t.get("epoch_ends"), -1), (int) asLong(t.get("snapshots"), 0));
    }

    /**
     * The replicate file's {@code prediction}: skipped with its reason, or predicted, then with {@code stable} and,
     * when unstable, the update it became unstable at (the file has no numbers from there on: JSON null).
     */
    private static Prediction prediction(Path file, Object node) {
        Map<String, Object> p = node instanceof Map ? cast(node) : null;
        if (p == null || !asBoolean(p.get("predicted"))) {
            return Prediction.skipped(p != null ? asText(p.get("skipped"), "not recorded") : "not recorded");
        }
        if (!(p.get("stable") instanceof Boolean)) {
            throw new StudyFormatException(file + ": prediction.stable must be true or false in a predicted noise ball");
        }
        boolean stable = asBoolean(p.get("stable"));
        long unstableFrom = 0;
        double unstableProduct = Double.NaN;
        if (!stable) {
            unstableFrom = asLong(p.get("unstable_from_update"), 0);
            if (unstableFrom < 1) {
                throw new StudyFormatException(file + ": prediction.unstable_from_update must name an update ≥ 1 when"
                        + " the prediction is unstable");
            }
            unstableProduct = asDouble(p.get("unstable_rate_times_curvature"), Double.NaN);
        }
        double[] epochDistanceSq = p.containsKey("epoch_distance_sq") ? numbers(file, p, "epoch_distance_sq", true)
                : new double[0];
        Prediction.FixedPoint fixed = null;
        if (p.get("fixed_point") instanceof Map) {
            Map<String, Object> f = cast(p.get("fixed_point"));
            fixed = new Prediction.FixedPoint(asDouble(f.get("rate"), Double.NaN), (int) asLong(f.get("batch"), 0),
                    asBoolean(f.get("exists")), finite(f.get("distance_sq")), finite(f.get("distance_sq_epoch_end")),
                    finite(f.get("excess_loss")), asText(f.get("note"), ""));
        }
        return new Prediction(true, "", asText(p.get("kind"), ""), asText(p.get("label"), ""),
                asText(p.get("sampling"), ""), asDouble(p.get("momentum"), 0),
                asDouble(p.get("stability_bound"), Double.NaN),
                asDouble(p.get("largest_rate_times_curvature"), Double.NaN), stable, unstableFrom, unstableProduct,
                epochDistanceSq, (int) asLong(p.get("tail_updates"), -1), finite(p.get("tail_distance_sq")),
                (int) asLong(p.get("tail_epoch_ends"), -1), finite(p.get("tail_distance_sq_epoch_ends")),
                finite(p.get("tail_excess_loss")), finite(p.get("final_distance_sq")),
                finite(p.get("final_excess_loss")), finite(p.get("final_bias_sq")), finite(p.get("final_ball")),
                finite(p.get("tail_bias_sq")), finite(p.get("tail_ball")), fixed);
    }

    /** @return the number, or NaN when absent, null or not a number */
    private static double finite(Object v) {
        double x = asDouble(v, Double.NaN);
        return Double.isFinite(x) ? x : Double.NaN;
    }

    // ---------------------------------------------------------------- nudges.csv

    /**
     * @return the rows of {@code nudges.csv} (RFC 4180, a header row), in file order; empty when the file is absent
     */
    static List<NudgeRecord> nudgesCsv(Path file) throws IOException {
        List<NudgeRecord> out = new ArrayList<>();
        if (!Files.isRegularFile(file)) {
            return out;
        }
        List<List<String>> records = csv(Files.readString(file, StandardCharsets.UTF_8), file);
        if (records.isEmpty() || !String.join(",", records.get(0)).equals(NUDGES_HEADER)) {
            throw new StudyFormatException(file + ": line 1: expected the header " + NUDGES_HEADER);
        }
        for (int i = 1; i < records.size(); i++) {
            List<String> r = records.get(i);
            if (r.size() != 8) {
                throw new StudyFormatException(file + ": record " + (i + 1) + ": " + r.size() + " fields, expected 8 ("
                        + NUDGES_HEADER + ")");
            }
            try {
                out.add(new NudgeRecord(Integer.parseInt(r.get(0)), r.get(1), Integer.parseInt(r.get(2)),
                        Double.parseDouble(r.get(3)), Double.parseDouble(r.get(4)), r.get(5), r.get(6), r.get(7)));
            } catch (NumberFormatException e) {
                throw new StudyFormatException(file + ": record " + (i + 1) + ": arm_index and from_epoch must be whole"
                        + " numbers and factor and rate numbers (" + e.getMessage() + ")");
            }
        }
        return out;
    }

    /** RFC 4180 records: fields split at commas; a quoted field may hold commas, doubled quotes and line breaks. */
    private static List<List<String>> csv(String text, Path file) {
        List<List<String>> records = new ArrayList<>();
        List<String> record = new ArrayList<>();
        StringBuilder field = new StringBuilder();
        boolean quoted = false;
        boolean any = false;
        int line = 1;
        for (int i = 0; i < text.length(); i++) {
            char c = text.charAt(i);
            if (quoted) {
                if (c == '"') {
                    if (i + 1 < text.length() && text.charAt(i + 1) == '"') {
                        field.append('"');
                        i++;
                    } else {
                        quoted = false;
                    }
                } else {
                    if (c == '\n') {
                        line++;
                    }
                    field.append(c);
                }
            } else if (c == '"' && field.length() == 0) {
                quoted = true;
                any = true;
            } else if (c == ',') {
                record.add(field.toString());
                field.setLength(0);
                any = true;
            } else if (c == '\r' || c == '\n') {
                if (c == '\r' && i + 1 < text.length() && text.charAt(i + 1) == '\n') {
                    i++;
                }
                if (any || field.length() > 0) {
                    record.add(field.toString());
                    records.add(record);
                }
                record = new ArrayList<>();
                field.setLength(0);
                any = false;
                line++;
            } else {
                field.append(c);
                any = true;
            }
        }
        if (quoted) {
            throw new StudyFormatException(file + ": line " + line + ": a quoted field is not closed");
        }
        if (any || field.length() > 0) {
            record.add(field.toString());
            records.add(record);
        }
        return records;
    }

    // ---------------------------------------------------------------- typed access to a lean tree

    @SuppressWarnings("unchecked")
    private static Map<String, Object> cast(Object node) {
        return (Map<String, Object>) node;
    }

    private static Object field(Path file, Map<String, Object> node, String key) {
        Object v = node.get(key);
        if (v == null) {
            throw new StudyFormatException(file + ": missing key '" + key + "'");
        }
        return v;
    }

    /** @return a JSON value as a message shows it */
    private static String show(Object v) {
        if (v instanceof String s) {
            return "\"" + s + "\"";
        }
        if (v instanceof Map) {
            return "an object";
        }
        if (v instanceof List) {
            return "an array";
        }
        return String.valueOf(v);
    }

    private static boolean isNumber(Object v) {
        return v instanceof Long || v instanceof Double;
    }

    private static int integer(Path file, Map<String, Object> node, String key) {
        Object v = field(file, node, key);
        if (!(v instanceof Long l) || l != (int) (long) l) {
            throw new StudyFormatException(file + ": '" + key + "' must be a whole number, not " + show(v));
        }
        return (int) (long) l;
    }

    private static double number(Path file, Map<String, Object> node, String key) {
        Object v = field(file, node, key);
        if (!isNumber(v)) {
            throw new StudyFormatException(file + ": '" + key + "' must be a number, not " + show(v));
        }
        return ((Number) v).doubleValue();
    }

    private static String text(Path file, Map<String, Object> node, String key) {
        Object v = field(file, node, key);
        if (!(v instanceof String s)) {
            throw new StudyFormatException(file + ": '" + key + "' must be a string, not " + show(v));
        }
        return s;
    }

    private static Map<String, Object> object(Path file, Map<String, Object> node, String key) {
        Object v = field(file, node, key);
        if (!(v instanceof Map)) {
            throw new StudyFormatException(file + ": '" + key + "' must be an object");
        }
        return cast(v);
    }

    /** @return the object at key, or an empty one when absent or not an object */
    private static Map<String, Object> optionalObject(Map<String, Object> node, String key) {
        Object v = node.get(key);
        return v instanceof Map ? cast(v) : Map.of();
    }

    /** @return an array's elements (numbers as Double, nulls as {@link LeanJson#NULL}) */
    private static List<Object> array(Path file, Map<String, Object> node, String key) {
        Object v = field(file, node, key);
        if (v instanceof List) {
            @SuppressWarnings("unchecked")
            List<Object> list = (List<Object>) v;
            return list;
        }
        if (v instanceof LeanJson.Numbers numbers) {
            List<Object> list = new ArrayList<>(numbers.values().length);
            for (double x : numbers.values()) {
                list.add(Double.isNaN(x) ? LeanJson.NULL : (Object) x);
            }
            return list;
        }
        throw new StudyFormatException(file + ": '" + key + "' must be an array");
    }

    private static Map<String, Object> element(Path file, List<Object> list, int i, String key) {
        Object v = list.get(i);
        if (!(v instanceof Map)) {
            throw new StudyFormatException(file + ": " + key + "[" + i + "] must be an object, not " + show(v));
        }
        return cast(v);
    }

    /** @return the string at {@code key} of an object found at key path {@code at}, which messages name */
    private static String textAt(Path file, Map<String, Object> node, String key, String at) {
        Object v = node.get(key);
        if (v == null) {
            throw new StudyFormatException(file + ": missing key '" + at + "." + key + "'");
        }
        if (!(v instanceof String s)) {
            throw new StudyFormatException(file + ": " + at + "." + key + " must be a string, not " + show(v));
        }
        return s;
    }

    /** @return the strings of the array at {@code key} of an object found at key path {@code at} */
    private static List<String> textsAt(Path file, Map<String, Object> node, String key, String at) {
        if (node.get(key) == null) {
            throw new StudyFormatException(file + ": missing key '" + at + "." + key + "'");
        }
        List<Object> a = array(file, node, key);
        List<String> out = new ArrayList<>(a.size());
        for (int i = 0; i < a.size(); i++) {
            if (!(a.get(i) instanceof String s)) {
                throw new StudyFormatException(file + ": " + at + "." + key + "[" + i + "] must be a string, not "
                        + show(a.get(i)));
            }
            out.add(s);
        }
        return out;
    }

    private static List<String> strings(Path file, Map<String, Object> node, String key) {
        List<Object> a = array(file, node, key);
        List<String> out = new ArrayList<>(a.size());
        for (Object v : a) {
            out.add(asText(v, v == LeanJson.NULL ? "" : show(v)));
        }
        return out;
    }

    /** @return the array's numbers; null entries become NaN when {@code nullable}, else are an error */
    private static double[] numbers(Path file, Map<String, Object> node, String key, boolean nullable) {
        Object v = field(file, node, key);
        if (v instanceof LeanJson.Numbers numbers) {
            if (!nullable && numbers.firstNull() >= 0) {
                throw new StudyFormatException(file + ": '" + key + "'[" + numbers.firstNull()
                        + "] must be a number, not null");
            }
            return numbers.values();
        }
        List<Object> a = array(file, node, key);
        for (int i = 0; i < a.size(); i++) {
            Object x = a.get(i);
            if (!isNumber(x) && !(x == LeanJson.NULL && nullable)) {
                throw new StudyFormatException(file + ": '" + key + "'[" + i + "] must be a number, not " + show(x));
            }
        }
        throw new IllegalStateException("unreachable: a list of numbers is read as numbers");
    }

    private static String asText(Object v, String otherwise) {
        return v instanceof String s ? s : otherwise;
    }

    private static long asLong(Object v, long otherwise) {
        return v instanceof Long l ? l : v instanceof Double d ? (long) (double) d : otherwise;
    }

    private static double asDouble(Object v, double otherwise) {
        return isNumber(v) ? ((Number) v).doubleValue() : otherwise;
    }

    private static boolean asBoolean(Object v) {
        return Boolean.TRUE.equals(v);
    }
}
