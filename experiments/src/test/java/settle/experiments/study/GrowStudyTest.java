package settle.experiments.study;

import static org.junit.jupiter.api.Assertions.assertArrayEquals;
import static org.junit.jupiter.api.Assertions.assertEquals;
import static org.junit.jupiter.api.Assertions.assertFalse;
import static org.junit.jupiter.api.Assertions.assertTrue;

import com.fasterxml.jackson.databind.JsonNode;
import com.fasterxml.jackson.databind.ObjectMapper;
import java.io.StringWriter;
import java.nio.file.Files;
import java.nio.file.Path;
import java.util.ArrayList;
import java.util.LinkedHashMap;
import java.util.List;
import java.util.Map;
import org.junit.jupiter.api.Test;
import org.junit.jupiter.api.io.TempDir;
import settle.reports.format.StudyReader;
import settle.reports.metrics.ArmNudges;

/**
 * Growing a study: {@code settle run} on an existing study directory whose shared settings (seed, data, model,
 * training) are unchanged keeps every finished replicate of an arm still in the plan, trains only new arms and new
 * replicate indices, moves a removed arm's directory to {@code retired/} (and back when the arm returns), and refuses
 * a changed shared setting naming each key. After each growth every replicate file, JSON and binary, and epochs.csv
 * and summary.csv, are byte for byte those of a fresh run of the grown plan.
 */
class GrowStudyTest {

    private static final ObjectMapper MAPPER = new ObjectMapper();

    private static final String CONSTANT = "  - name: constant\n    schedule: {kind: constant, rate: 0.3}";
    private static final String RECIPROCAL = "  - name: 'reciprocal, per update'\n"
            + "    schedule: {kind: reciprocal, rate: 0.3, decay: 0.01, per: update}";
    private static final String AVERAGED = "  - name: averaged\n    schedule: {kind: constant, rate: 0.3}\n"
            + "    average: tail";
    private static final String STEP = "  - name: cosine\n    schedule: {kind: cosine, rate: 0.3, floor: 0.003}";
    /** A manual arm. */
    private static final String STEERED = "  - name: steered\n    schedule: {kind: constant, rate: 0.3}\n"
            + "    manual: true";
    private static final String NUDGE_HEADER = "arm_index,arm,from_epoch,factor,rate,note,time,request";

    @TempDir
    Path dir;

    private int plans;

    /** A small convex plan: logistic regression on seeded Gaussian classes, with the arms given in order. */
    private static String plan(int replicates, int epochs, double l2, String... arms) {
        return String.join("\n",
                "study: grow",
                "seed: 7",
                "replicates: " + replicates,
                "data:",
                "  source: synthetic:gaussian?rows=240&features=3&classes=2&separation=1.5&seed=3",
                "  test-fraction: 0.25",
                "  standardize: true",
                "model:",
                "  kind: logistic",
                "  l2: " + l2,
                "training:",
                "  epochs: " + epochs,
                "  batch: 8",
                "  snapshots: 20",
                "baseline: constant",
                "arms:",
                String.join("\n", arms),
                "");
    }

    private static String plan(int replicates, String... arms) {
        return plan(replicates, 2, 0.01, arms);
    }

    /** A run's exit code, its stderr and the summary it printed with --json. */
    private record Run(int exit, String err, JsonNode summary) {
        int trainedNow() {
            return summary.path("trained_now").asInt();
        }
    }

    /** Runs {@code plan} into {@code study} with --json. */
    private Run run(String plan, Path study, String... more) throws Exception {
        Path file = dir.resolve("plan-" + plans++ + ".yaml");
        Files.writeString(file, plan);
        List<String> args = new ArrayList<>(List.of("run", file.toString(), "--out", study.toString(), "--quiet",
                "--json", "--threads", "2"));
        args.addAll(List.of(more));
        StringWriter out = new StringWriter();
        StringWriter err = new StringWriter();
        int exit = StudyRunnerTest.settle(out, err, args.toArray(String[]::new));
        JsonNode summary = out.toString().isBlank() ? MAPPER.nullNode() : MAPPER.readTree(out.toString());
        return new Run(exit, err.toString().trim(), summary);
    }

    /** Asserts that {@code grown} holds what a fresh run of {@code plan} writes, byte for byte. */
    private void assertSameAsFresh(String plan, Path grown) throws Exception {
        Path fresh = dir.resolve("fresh-" + plans);
        Run run = run(plan, fresh);
        assertEquals(0, run.exit(), run.err());
        StudyFiles.assertSameReplicateFiles(fresh, grown);
        for (String name : List.of("epochs.csv", "summary.csv", "plan.yaml", "encoding.json", "reference.json")) {
            assertArrayEquals(Files.readAllBytes(fresh.resolve(name)), Files.readAllBytes(grown.resolve(name)),
                    name + " differs from a fresh run's");
        }
        JsonNode a = MAPPER.readTree(fresh.resolve("manifest.json").toFile());
        JsonNode b = MAPPER.readTree(grown.resolve("manifest.json").toFile());
        for (String key : List.of("arms", "replicates", "settings_sha256", "plan_sha256", "grid")) {
            assertEquals(a.path(key), b.path(key), "manifest " + key);
        }
        StudySchema.validate(grown);
    }

    /** @return every file under the study's {@code arms/} and {@code retired/} with its bytes */
    private static Map<Path, byte[]> replicateBytes(Path study) throws Exception {
        Map<Path, byte[]> out = new LinkedHashMap<>();
        for (String top : List.of("arms", "retired")) {
            if (!Files.isDirectory(study.resolve(top))) {
                continue;
            }
            try (var walk = Files.walk(study.resolve(top))) {
                for (Path p : walk.sorted().toList()) {
                    if (Files.isRegularFile(p)) {
                        out.put(study.relativize(p), Files.readAllBytes(p));
                    }
                }
            }
        }
        return out;
    }

    /** @return the directory name (the arm id) of the arm named {@code name} in the study's manifest */
    private static String armId(Path study, String name) throws Exception {
        for (JsonNode arm : MAPPER.readTree(study.resolve("manifest.json").toFile()).path("arms")) {
            if (arm.path("name").asText().equals(name)) {
                return arm.path("id").asText();
            }
        }
        throw new AssertionError("no arm " + name + " in " + study);
    }

    @Test
    void addingAnArmTrainsOnlyTheNewArm() throws Exception {
        Path study = dir.resolve("study");
        assertEquals(12, run(plan(4, CONSTANT, RECIPROCAL, AVERAGED), study).trainedNow());
        Map<Path, byte[]> before = replicateBytes(study);

        String grown = plan(4, CONSTANT, RECIPROCAL, STEP, AVERAGED);
        Run run = run(grown, study);
        assertEquals(0, run.exit(), run.err());
        assertEquals(4, run.trainedNow(), "only the new arm's 4 replicates");
        assertEquals(16, run.summary().path("finished").asInt());
        Map<Path, byte[]> after = replicateBytes(study);
        for (Map.Entry<Path, byte[]> e : before.entrySet()) {
            assertArrayEquals(e.getValue(), after.get(e.getKey()), e.getKey() + " kept as it was");
        }
        assertEquals(before.size() + 8, after.size(), "the new arm's 4 JSON and 4 binary files");
        assertSameAsFresh(grown, study);
    }

    @Test
    void raisingReplicatesTrainsOnlyTheNewIndices() throws Exception {
        Path study = dir.resolve("study");
        assertEquals(6, run(plan(2, CONSTANT, RECIPROCAL, AVERAGED), study).trainedNow());
        String grown = plan(5, CONSTANT, RECIPROCAL, AVERAGED);
        Run run = run(grown, study);
        assertEquals(0, run.exit(), run.err());
        assertEquals(9, run.trainedNow(), "replicates 3 to 5 of each of the 3 arms");
        assertEquals(15, run.summary().path("replicates").asInt(), "3 arms × 5 replicates");
        assertSameAsFresh(grown, study);
    }

    @Test
    void reorderingArmsTrainsNothing() throws Exception {
        Path study = dir.resolve("study");
        run(plan(3, CONSTANT, RECIPROCAL, AVERAGED), study);
        Map<Path, byte[]> before = replicateBytes(study);
        String reordered = plan(3, AVERAGED, CONSTANT, RECIPROCAL);
        Run run = run(reordered, study);
        assertEquals(0, run.exit(), run.err());
        assertEquals(0, run.trainedNow(), "every arm is the same arm at another position");
        Map<Path, byte[]> after = replicateBytes(study);
        assertEquals(before.keySet(), after.keySet());
        for (Map.Entry<Path, byte[]> e : before.entrySet()) {
            assertArrayEquals(e.getValue(), after.get(e.getKey()), e.getKey() + " unchanged");
        }
        assertSameAsFresh(reordered, study);
    }

    @Test
    void aRemovedArmIsRetiredAndComesBackWhenPutBack() throws Exception {
        Path study = dir.resolve("study");
        String whole = plan(3, CONSTANT, RECIPROCAL, AVERAGED);
        run(whole, study);
        String id = armId(study, "averaged");
        Map<Path, byte[]> before = replicateBytes(study);

        String fewer = plan(3, CONSTANT, RECIPROCAL);
        Run run = run(fewer, study);
        assertEquals(0, run.exit(), run.err());
        assertEquals(0, run.trainedNow());
        assertEquals("settle run: arms/" + id + " is not an arm of this plan: moved to retired/" + id
                + " (kept; an arm put back is moved back)", run.err());
        assertFalse(Files.exists(study.resolve("arms").resolve(id)));
        for (int k = 1; k <= 3; k++) {
            for (String ext : List.of(".json", ".bin")) {
                Path retired = Path.of("retired", id, k + ext);
                assertArrayEquals(before.get(Path.of("arms", id, k + ext)), Files.readAllBytes(study.resolve(retired)),
                        retired + " kept, byte for byte");
            }
        }
        assertSameAsFresh(fewer, study);

        run = run(whole, study);
        assertEquals(0, run.exit(), run.err());
        assertEquals(0, run.trainedNow(), "the arm's replicates are used again");
        assertEquals("settle run: retired/" + id + " is an arm of this plan again: moved back to arms/" + id
                + ", its replicates kept", run.err());
        assertFalse(Files.exists(study.resolve("retired").resolve(id)));
        assertEquals(before.keySet(), replicateBytes(study).keySet());
        assertSameAsFresh(whole, study);
    }

    @Test
    void loweringReplicatesKeepsTheHigherFilesAndUsesTheFirstN() throws Exception {
        Path study = dir.resolve("study");
        String four = plan(4, CONSTANT, RECIPROCAL);
        run(four, study);
        Map<Path, byte[]> before = replicateBytes(study);
        String two = plan(2, CONSTANT, RECIPROCAL);
        Run run = run(two, study);
        assertEquals(0, run.exit(), run.err());
        assertEquals(0, run.trainedNow());
        assertEquals(4, run.summary().path("replicates").asInt(), "2 arms × the first 2 replicates");
        assertEquals(before.keySet(), replicateBytes(study).keySet(), "replicates 3 and 4 are kept on disk");
        JsonNode manifest = MAPPER.readTree(study.resolve("manifest.json").toFile());
        assertEquals(4, manifest.path("replicates").size());
        Path fresh = dir.resolve("fresh-two");
        run(two, fresh);
        for (String name : List.of("epochs.csv", "summary.csv")) {
            assertArrayEquals(Files.readAllBytes(fresh.resolve(name)), Files.readAllBytes(study.resolve(name)), name);
        }
        run = run(four, study);
        assertEquals(0, run.trainedNow(), "raised again: replicates 3 and 4 are read back, not trained");
        assertSameAsFresh(four, study);
    }

    @Test
    void aChangedSharedSettingIsRefusedNamingEachKey() throws Exception {
        Path study = dir.resolve("study");
        run(plan(3, 2, 0.01, CONSTANT, RECIPROCAL), study);
        Map<Path, byte[]> before = replicateBytes(study);
        byte[] manifest = Files.readAllBytes(study.resolve("manifest.json"));

        Run run = run(plan(4, 3, 0.02, CONSTANT, RECIPROCAL, STEP), study);
        assertEquals(2, run.exit());
        assertEquals(study + ": changed since this study was run: model.l2: 0.02 (was 0.01),"
                + " training.epochs: 3 (was 2); a study grows (arms, replicates) only while its seed, data, model"
                + " and training stay the same: use --fresh to discard its results, or --out DIR for a new study",
                run.err());
        assertEquals(-1, run.err().indexOf('\n'), "one line");
        Map<Path, byte[]> after = replicateBytes(study);
        assertEquals(before.keySet(), after.keySet(), "nothing trained, moved or removed");
        assertArrayEquals(manifest, Files.readAllBytes(study.resolve("manifest.json")), "the manifest untouched");

        run = run(plan(3, 2, 0.01, CONSTANT, RECIPROCAL).replace("seed: 7", "seed: 8"), study);
        assertEquals(2, run.exit());
        assertTrue(run.err().contains(": changed since this study was run: seed: 8 (was 7); "), run.err());
    }

    /**
     * Runs a study of the manual arm {@code steered} then {@code constant}, 2 replicates, and writes its nudges.csv
     * by hand: one nudge of steered (arm 1) from epoch 2 by {@code factor} (the text as the file holds it).
     *
     * @return the study directory
     */
    private Path nudgedStudy(String factor) throws Exception {
        Path study = dir.resolve("study");
        Run first = run(plan(2, STEERED, CONSTANT), study);
        assertEquals(0, first.exit(), first.err());
        Files.writeString(study.resolve("nudges.csv"), NUDGE_HEADER + "\r\n1,steered,2," + factor
                + ",0.15,flat,2026-12-05T10:00:00Z,r1\r\n");
        return study;
    }

    @Test
    void aRefusedNudgeLogLeavesTheStudyAsItWas() throws Exception {
        // A run that refuses the study's nudges.csv must refuse before it writes plan.yaml or retires an arm, like
        // every other refusal of a study
        Path study = nudgedStudy("half");
        Map<Path, byte[]> before = replicateBytes(study);
        byte[] plan = Files.readAllBytes(study.resolve("plan.yaml"));
        byte[] manifest = Files.readAllBytes(study.resolve("manifest.json"));

        Run run = run(plan(2, CONSTANT, STEP), study);
        assertEquals(2, run.exit(), run.err());
        assertTrue(run.err().startsWith(study.resolve("nudges.csv") + ":2:"), run.err());
        assertEquals(-1, run.err().indexOf('\n'), "one line");
        assertEquals(before.keySet(), replicateBytes(study).keySet(), "no arm retired, nothing trained");
        assertFalse(Files.exists(study.resolve("retired")), "no arm retired");
        assertArrayEquals(plan, Files.readAllBytes(study.resolve("plan.yaml")), "plan.yaml untouched");
        assertArrayEquals(manifest, Files.readAllBytes(study.resolve("manifest.json")), "the manifest untouched");
    }

    @Test
    void aNudgedManualArmIsRetiredLikeAnyOtherAndComesBackWithItsNudges() throws Exception {
        // Removing a manual arm that was nudged grows the study like removing any arm: its directory is retired and
        // its nudges stay in nudges.csv, replayed when the arm is put back
        Path study = nudgedStudy("0.5");
        String log = Files.readString(study.resolve("nudges.csv"));
        String id = armId(study, "steered");

        Run removed = run(plan(3, CONSTANT, STEP), study);
        assertEquals(0, removed.exit(), removed.err());
        assertTrue(Files.isDirectory(study.resolve("retired").resolve(id)), "steered retired");
        assertEquals(log, Files.readString(study.resolve("nudges.csv")), "its nudges kept");

        Run back = run(plan(2, STEERED, CONSTANT, STEP), study);
        assertEquals(0, back.exit(), back.err());
        assertEquals(0, back.trainedNow(), "steered's replicates moved back, nothing trained");
        assertEquals(1, ArmNudges.of(StudyReader.read(study)).get(0).size(), "its nudge shown on it again");
    }

    @Test
    void aNudgeStaysWithItsArmWhenTheArmsAreReordered() throws Exception {
        // nudges.csv records the arm's index at the time of the nudge; a plan that grew may have moved the arm, and
        // the report must mark the nudge on the arm of that name, as the runner replays it
        Path study = nudgedStudy("0.5");

        Run run = run(plan(2, CONSTANT, STEERED), study);
        assertEquals(0, run.exit(), run.err());
        List<List<ArmNudges.Mark>> marks = ArmNudges.of(StudyReader.read(study));
        assertEquals(List.of(), marks.get(0), "constant, now arm 1, was never nudged");
        assertEquals(1, marks.get(1).size(), "steered, now arm 2, has its nudge");
        assertEquals(0.5, marks.get(1).get(0).factor());
    }

    @Test
    void aLongSettingThatChangedNearItsEndIsShownAroundTheChange() throws Exception {
        // values are cut to 60 characters in a message; a data source that changed in its 70th character would show
        // the same cut text twice, so the line shows each from a little before the first difference
        Path study = dir.resolve("study");
        assertEquals(0, run(plan(2, CONSTANT, STEP), study).exit());
        Run run = run(plan(2, CONSTANT, STEP).replace("separation=1.5&seed=3", "separation=1.5&seed=4"), study);
        assertEquals(2, run.exit());
        assertTrue(run.err().contains(": changed since this study was run: data.source:"
                + " '…separation=1.5&seed=4' (was '…separation=1.5&seed=3'), the data (its SHA-256); "),
                run.err());
    }
}
