package settle.experiments.study;

import static org.junit.jupiter.api.Assertions.assertEquals;
import static org.junit.jupiter.api.Assertions.assertFalse;
import static org.junit.jupiter.api.Assertions.assertTrue;

import com.fasterxml.jackson.databind.JsonNode;
import com.fasterxml.jackson.databind.ObjectMapper;
import java.nio.charset.StandardCharsets;
import java.nio.file.Files;
import java.nio.file.Path;
import java.util.ArrayList;
import java.util.List;

/**
 * Checks a study directory against the written schema of format 4 (README, "Study directory"): every file
 * present, every field there with its type, sizes consistent across files.
 */
final class StudySchema {

    private static final ObjectMapper MAPPER = new ObjectMapper();

    /** The keys of a replicate's {@code metrics}, in the order written (README, replicate file). */
    static final List<String> METRICS = List.of("final_objective", "final_gap", "final_distance", "tail_radius",
            "tail_distance", "tail_radius_epoch_ends", "tail_distance_epoch_ends", "tail_loss_spread",
            "averaged_objective", "averaged_gap", "test_loss", "test_accuracy");
    /** The keys of a finished replicate's {@code tail}, in the order written. */
    static final List<String> TAIL = List.of("first_update", "length", "epoch_ends", "snapshots", "snapshot_updates",
            "snapshot_objectives");

    private StudySchema() {
    }

    static void validate(Path dir) throws Exception {
        for (String file : List.of("plan.yaml", "manifest.json", "epochs.csv")) {
            assertTrue(Files.isRegularFile(dir.resolve(file)), dir + " lacks " + file);
        }
        JsonNode m = MAPPER.readTree(dir.resolve("manifest.json").toFile());
        assertEquals(4, m.path("format").asInt(), "manifest format");
        for (String key : List.of("plan_sha256", "data_sha256", "split_sha256")) {
            assertTrue(m.path(key).asText().matches("[0-9a-f]{64}"), key);
        }
        for (String key : List.of("generator", "started", "ended", "executor", "model", "baseline")) {
            assertTrue(m.path(key).isTextual(), "manifest." + key);
        }
        for (String key : List.of("threads", "root_seed", "parameters")) {
            assertTrue(m.path(key).isIntegralNumber(), "manifest." + key);
        }
        assertTrue(m.path("tool").path("version").isTextual() && m.path("tool").path("git_commit").isTextual());
        assertTrue(m.path("jvm").path("version").isTextual() && m.path("cpu").path("cores").isInt());
        assertTrue(m.path("command").isArray() && m.path("command").size() > 0);
        JsonNode data = m.path("data");
        for (String key : List.of("rows", "features", "train_rows", "test_rows", "holdout_rows", "updates_per_epoch")) {
            assertTrue(data.path(key).isInt(), "manifest.data." + key);
        }
        assertEquals(data.path("features").asInt(), data.path("feature_names").size());
        int classes = data.path("class_names").size();
        assertTrue(classes >= 2);
        assertTrue(m.path("standardisation").isNull() || m.path("standardisation").path("means").size()
                == data.path("features").asInt());
        int arms = m.path("arms").size();
        assertTrue(arms >= 1);
        assertTrue(m.path("settings_sha256").asText().matches("[0-9a-f]{64}"), "settings_sha256");
        java.util.Set<String> ids = new java.util.HashSet<>();
        for (int a = 0; a < arms; a++) {
            JsonNode arm = m.path("arms").get(a);
            assertEquals(a + 1, arm.path("index").asInt());
            String id = arm.path("id").asText();
            assertTrue(id.matches("[A-Za-z0-9_-][A-Za-z0-9_.-]{0,39}-[0-9a-f]{12}"), "arms[].id: " + id);
            assertTrue(ids.add(id), "arm ids are distinct: " + id);
            assertEquals("arms/" + id, arm.path("directory").asText());
            assertTrue(arm.path("name").isTextual());
        }
        JsonNode enc = MAPPER.readTree(dir.resolve("encoding.json").toFile());
        assertEquals(settle.reports.format.StudyFormat.VERSION, enc.path("format").asInt(), "encoding format");
        assertTrue(List.of("table", "plain").contains(enc.path("kind").asText()), "encoding.kind");
        List<String> outputs = new ArrayList<>();
        for (JsonNode f : enc.path("features")) {
            f.path("outputs").forEach(o -> outputs.add(o.asText()));
        }
        List<String> names = new ArrayList<>();
        data.path("feature_names").forEach(n -> names.add(n.asText()));
        assertEquals(names, outputs, "encoding.json's outputs are the manifest's feature names");
        assertEquals(data.path("test_rows").asInt(), enc.path("test_labels").size(), "encoding.test_labels");
        for (JsonNode y : enc.path("test_labels")) {
            assertTrue(y.isInt() && y.asInt() >= 0 && y.asInt() < classes, "encoding.test_labels[]");
        }
        assertTrue(m.path("study").isTextual() && !m.path("study").asText().isBlank(), "manifest.study");
        assertTrue(m.path("model_l2").isNumber() && m.path("model_l2").asDouble() >= 0, "manifest.model_l2");
        JsonNode training = m.path("training");
        assertEquals(List.of("epochs", "batch", "sampling", "momentum", "tail", "snapshots"), fieldNames(training),
                "manifest.training keys in order");
        int plannedEpochs = training.path("epochs").asInt();
        int batch = training.path("batch").asInt();
        assertTrue(training.path("epochs").isInt() && plannedEpochs >= 1, "manifest.training.epochs");
        assertTrue(training.path("batch").isInt() && batch >= 1, "manifest.training.batch");
        assertTrue(List.of("shuffle", "replacement").contains(training.path("sampling").asText()),
                "manifest.training.sampling");
        double beta = training.path("momentum").asDouble(-1);
        assertTrue(training.path("momentum").isNumber() && beta >= 0 && beta < 1, "manifest.training.momentum");
        double tau = training.path("tail").asDouble(-1);
        assertTrue(training.path("tail").isNumber() && tau > 0 && tau <= 1, "manifest.training.tail");
        assertTrue(training.path("snapshots").isInt() && training.path("snapshots").asInt() >= 1,
                "manifest.training.snapshots");
        // an epoch is ⌈N/B⌉ updates in both samplings (README, "Training")
        assertEquals((data.path("train_rows").asInt() + batch - 1) / batch, data.path("updates_per_epoch").asInt(),
                "updates_per_epoch is ⌈train_rows / training.batch⌉");
        assertTrue(m.path("grid").isArray(), "manifest.grid");
        boolean[] inGrid = new boolean[arms];
        for (JsonNode grid : m.path("grid")) {
            assertTrue(grid.path("arm").isTextual(), "grid[].arm");
            List<String> keys = new ArrayList<>();
            List<List<String>> values = new ArrayList<>();
            for (JsonNode key : grid.path("keys")) {
                keys.add(key.path("name").asText());
                List<String> written = new ArrayList<>();
                key.path("values").forEach(v -> written.add(v.asText()));
                assertTrue(!written.isEmpty() && key.path("values").get(0).isTextual(), "grid[].keys[].values");
                values.add(written);
            }
            assertTrue(!keys.isEmpty() && grid.path("arms").size() > 0, "a grid sweeps keys into arms");
            for (JsonNode arm : grid.path("arms")) {
                int index = arm.path("index").asInt();
                assertTrue(index >= 1 && index <= arms && !inGrid[index - 1], "grid[].arms[].index " + index);
                inGrid[index - 1] = true;
                assertEquals(keys.size(), arm.path("values").size());
                // The runner names an expanded arm TEMPLATE[key=value,…] with the values as written.
                StringBuilder name = new StringBuilder(grid.path("arm").asText()).append('[');
                for (int k = 0; k < keys.size(); k++) {
                    String v = arm.path("values").get(k).asText();
                    assertTrue(values.get(k).contains(v), v + " is one of the values of " + keys.get(k));
                    name.append(k == 0 ? "" : ",").append(keys.get(k)).append('=').append(v);
                }
                assertEquals(name.append(']').toString(), m.path("arms").get(index - 1).path("name").asText());
            }
        }
        boolean convex = m.path("reference").asText().equals("reference.json");
        int parameters = m.path("parameters").asInt();
        if (convex) {
            JsonNode ref = MAPPER.readTree(dir.resolve("reference.json").toFile());
            assertEquals(parameters, ref.path("theta").size());
            assertTrue(ref.path("objective").isNumber() && ref.path("gradient_norm").isNumber());
            JsonNode bound = ref.path("last_iterate_bound");
            assertTrue(bound.isObject(), "reference.json has the a-priori bound block");
            if (!bound.has("skipped")) {
                assertEquals(arms, bound.path("arms").size(), "one bound value per arm");
                for (int a = 0; a < arms; a++) {
                    JsonNode arm = bound.path("arms").get(a);
                    assertEquals(a + 1, arm.path("index").asInt());
                    assertEquals(m.path("arms").get(a).path("name").asText(), arm.path("name").asText());
                    // An arm whose replicate 1 finished without nudge or cut ran exactly its planned rates: the
                    // recorded value is the bound of those rates with the recorded D and G.
                    Path first = dir.resolve(m.path("arms").get(a).path("directory").asText()).resolve("1.json");
                    if (!Files.isRegularFile(first)) {
                        continue;
                    }
                    JsonNode r = StudyFiles.replicate(first);
                    if (r.path("status").asText().equals("finished") && r.path("nudges").isEmpty()
                            && r.path("plateau_cuts").isEmpty()) {
                        double[] rates = new double[r.path("rates").size()];
                        for (int i = 0; i < rates.length; i++) {
                            rates[i] = r.path("rates").get(i).asDouble();
                        }
                        assertEquals(settle.engine.theory.LastIterateBound.value(rates, bound.path("d").asDouble(),
                                bound.path("g").asDouble()), arm.path("value").asDouble(), 0.0, "bound of arm " + (a + 1));
                    }
                }
            }
        }
        int epochRows = 0;
        for (JsonNode rep : m.path("replicates")) {
            String status = rep.path("status").asText();
            assertTrue(List.of("finished", "diverged", "missing").contains(status), status);
            if (status.equals("missing")) {
                continue;
            }
            JsonNode arm = m.path("arms").get(rep.path("arm").asInt() - 1);
            Path file = dir.resolve(arm.path("directory").asText()).resolve(rep.path("replicate").asInt() + ".json");
            JsonNode r = StudyFiles.replicate(file);
            assertEquals(4, r.path("format").asInt());
            JsonNode own = MAPPER.readTree(file.toFile());
            for (String big : List.of("rates", "start", "last")) {
                assertTrue(!own.has(big), big + " lives in the binary file, not in the JSON");
            }
            assertTrue(!own.path("test_probabilities").has("values") && !own.path("snapshots").has("values"),
                    "matrices' values live in the binary file");
            assertFalse(r.has("arm"), "a replicate file does not record its arm's position");
            assertEquals(arm.path("id").asText(), r.path("arm_id").asText());
            assertEquals(arm.path("name").asText(), r.path("arm_name").asText());
            assertEquals(status, r.path("status").asText());
            assertTrue(r.path("seeds").path("algorithm").isTextual() && r.path("seeds").path("root").isIntegralNumber());
            long updates = r.path("updates_run").asLong();
            assertEquals(updates, r.path("rates").size());
            assertEquals(parameters, r.path("start").size());
            assertEquals(parameters, r.path("last").size());
            JsonNode epochs = r.path("epochs");
            int e = epochs.path("epoch").size();
            epochRows += e;
            for (String series : List.of("last_update", "rate", "objective", "holdout_loss", "test_loss",
                    "test_accuracy", "distance")) {
                assertEquals(e, epochs.path(series).size(), "epochs." + series);
            }
            assertTrue(r.path("prediction").path("predicted").isBoolean());
            assertTrue(r.path("nudges").isArray(), "nudges");
            for (JsonNode nudge : r.path("nudges")) {
                assertTrue(nudge.path("from_epoch").asInt() >= 1 && nudge.path("factor").asDouble() > 0
                        && nudge.path("note").isTextual(), "nudge " + nudge);
            }
            assertTrue(r.path("plateau_cuts").isArray(), "plateau_cuts");
            int previousCut = 1;
            for (JsonNode cut : r.path("plateau_cuts")) {
                assertTrue(cut.path("from_epoch").asInt() > previousCut, "plateau cuts in epoch order, from epoch 2");
                previousCut = cut.path("from_epoch").asInt();
            }
            JsonNode metrics = r.path("metrics");
            assertEquals(METRICS, fieldNames(metrics), "metrics keys in order");
            if (status.equals("finished")) {
                assertEquals(r.path("total_updates").asLong(), updates);
                assertEquals(parameters, r.path("tail_mean").size());
                for (String key : List.of("tail_radius", "tail_radius_epoch_ends", "tail_loss_spread")) {
                    assertTrue(metrics.path(key).isNumber(), key);
                }
                assertTrue(metrics.path("test_accuracy").isNumber(), "test accuracy");
                assertEquals(convex, metrics.path("final_gap").isNumber(), "final gap iff convex");
                assertEquals(convex, metrics.path("tail_distance").isNumber(), "tail distance iff convex");
                assertEquals(convex, metrics.path("tail_distance_epoch_ends").isNumber(), "epoch-end form iff convex");
                JsonNode tail = r.path("tail");
                assertEquals(TAIL, fieldNames(tail), "tail keys in order");
                long first = tail.path("first_update").asLong();
                long total = r.path("total_updates").asLong();
                assertEquals((long) plannedEpochs * data.path("updates_per_epoch").asInt(), total,
                        "T is training.epochs × updates_per_epoch");
                assertTrue(tail.path("snapshots").asInt() <= training.path("snapshots").asInt(),
                        "no more tail snapshots than training.snapshots");
                assertEquals(total - first + 1, tail.path("length").asLong());
                int perEpoch = data.path("updates_per_epoch").asInt();
                assertEquals(total / perEpoch - (first - 1) / perEpoch, tail.path("epoch_ends").asLong(),
                        "epoch ends in the tail");
                assertEquals(tail.path("snapshots").asInt(), tail.path("snapshot_updates").size());
                assertEquals(tail.path("snapshots").asInt(), tail.path("snapshot_objectives").size());
                long previous = first - 1;
                for (JsonNode update : tail.path("snapshot_updates")) {
                    assertTrue(update.asLong() > previous, "snapshot updates strictly increasing, in the tail");
                    previous = update.asLong();
                }
                assertEquals(total, previous, "the last snapshot is the last update");
                JsonNode probabilities = r.path("test_probabilities");
                assertEquals(classes, probabilities.path("columns").asInt());
                assertEquals(data.path("test_rows").asInt(), probabilities.path("rows").asInt());
                assertEquals(probabilities.path("rows").asInt() * classes, probabilities.path("values").size());
                JsonNode predicted = probabilities.path("classes");
                assertEquals(probabilities.path("rows").asInt(), predicted.size(), "one predicted class per test row");
                for (int row = 0; row < predicted.size(); row++) {
                    int c = predicted.get(row).asInt();
                    assertTrue(c >= 0 && c < classes && predicted.get(row).asDouble() == c, "class index " + c);
                    double chosen = probabilities.path("values").get(row * classes + c).asDouble();
                    for (int k = 0; k < classes; k++) {
                        assertTrue(probabilities.path("values").get(row * classes + k).asDouble() <= chosen,
                                "row " + row + "'s predicted class is one of its most probable");
                    }
                }
                if (!r.path("snapshots").isNull()) {
                    assertEquals(parameters, r.path("snapshots").path("columns").asInt());
                }
                if (r.path("prediction").path("predicted").asBoolean()) {
                    assertEquals(e, r.path("prediction").path("epoch_distance_sq").size());
                } else {
                    assertTrue(r.path("prediction").path("skipped").asText().length() > 10);
                }
            }
        }
        List<String> lines = Files.readAllLines(dir.resolve("epochs.csv"), StandardCharsets.UTF_8);
        assertEquals("arm,arm_name,replicate,epoch,last_update,rate,objective,holdout_loss,test_loss,test_accuracy,distance",
                lines.get(0));
        assertEquals(epochRows, lines.size() - 1, "one epochs.csv row per recorded epoch");
    }

    private static List<String> fieldNames(JsonNode node) {
        List<String> names = new ArrayList<>();
        node.fieldNames().forEachRemaining(names::add);
        return names;
    }
}
