package settle.reports;

import static org.junit.jupiter.api.Assertions.assertEquals;
import static org.junit.jupiter.api.Assertions.assertFalse;
import static org.junit.jupiter.api.Assertions.assertNotNull;
import static org.junit.jupiter.api.Assertions.assertNull;
import static org.junit.jupiter.api.Assertions.assertThrows;
import static org.junit.jupiter.api.Assertions.assertTrue;

import com.fasterxml.jackson.databind.ObjectMapper;
import com.fasterxml.jackson.databind.node.ArrayNode;
import com.fasterxml.jackson.databind.node.ObjectNode;
import java.nio.file.Files;
import java.nio.file.Path;
import java.util.List;
import org.junit.jupiter.api.Test;
import org.junit.jupiter.api.io.TempDir;
import settle.reports.format.Metric;
import settle.reports.format.Prediction;
import settle.reports.format.Replicate;
import settle.reports.format.Study;
import settle.input.BadInputException;
import settle.reports.format.StudyReader;

class StudyReaderTest {

    /** @return what a refusal of an invalid replicate file of {@code study} says to do */
    static String remedy(Path study) {
        return "settle run " + study.resolve("plan.yaml") + " --out " + study + " sets invalid replicate files aside and"
                + " trains them again";
    }

    @TempDir
    Path dir;

    private static SyntheticStudy twoArms() {
        SyntheticStudy s = new SyntheticStudy();
        List<SyntheticStudy.Rep> a = s.arm("constant", false, 3);
        List<SyntheticStudy.Rep> b = s.arm("decay", false, 3);
        s.tailRadius(a, 1.0, 1.1, 1.2);
        s.tailRadius(b, 0.5, 0.6, 0.7);
        b.get(2).status = "diverged";
        return s;
    }

    @Test
    void readsEveryFileAndLeavesMissingReplicatesNull() throws Exception {
        Path study = twoArms().write(dir.resolve("s"), "2/2");
        Study s = StudyReader.read(study);
        assertEquals(List.of("constant", "decay"), s.manifest().arms());
        assertEquals(3, s.replicateCount());
        assertEquals(1, s.missing());
        assertEquals(1, s.diverged());
        assertNull(s.replicate(1, 1));
        assertNotNull(s.reference());
        assertEquals(0.6, s.replicate(1, 0).metric(Metric.TAIL_RADIUS) + 0.1, 1e-15);
        assertTrue(Double.isNaN(s.replicate(1, 2).metric(Metric.TAIL_RADIUS)), "a diverged replicate's metrics are null");
        assertTrue(s.planText().startsWith("study: synthetic"));
    }

    @Test
    void aPartialStudyStillGetsItsReport() throws Exception {
        Path study = twoArms().write(dir.resolve("s"), "2/2");
        Report.Outcome o = Report.write(study);
        assertTrue(o.partial());
        assertEquals(1, o.missing());
        assertTrue(Files.readString(study.resolve("report.html")).contains("1 replicate is missing"));
    }

    @Test
    void clearOneLineErrors() throws Exception {
        BadInputException none = assertThrows(BadInputException.class, () -> StudyReader.read(dir.resolve("nope")));
        assertEquals(dir.resolve("nope") + ": no such study directory", none.getMessage());

        Files.createDirectories(dir.resolve("empty"));
        assertTrue(assertThrows(BadInputException.class, () -> StudyReader.read(dir.resolve("empty"))).getMessage()
                .contains("not a study directory (no manifest.json"));

        Path study = twoArms().write(dir.resolve("s"));
        Path file = study.resolve(twoArms().path(1, 2));
        Files.writeString(file, "{\"format\": 4,\n  \"arm\": oops}");
        String message = assertThrows(BadInputException.class, () -> StudyReader.read(study)).getMessage();
        assertEquals(file + ":2:10: not valid JSON: it holds something that is not JSON here; " + remedy(study), message);
        assertEquals(-1, message.indexOf('\n'), "one line");

        Path manifest = study.resolve("manifest.json");
        Files.writeString(manifest, Files.readString(manifest).replace("\"format\":4", "\"format\":5"));
        assertEquals(manifest + ": format: study directory format 5 is not supported; this settle reads format 4",
                assertThrows(BadInputException.class, () -> StudyReader.read(study)).getMessage());
    }

    @Test
    void aReplicateWhosePlannedUpdatesAreNotTheManifestsIsRefused() throws Exception {
        // the fixture trains 4 epochs of 5 updates; a manifest that says 5 epochs plans 25 updates a replicate
        Path study = twoArms().write(dir.resolve("t"));
        Path manifest = study.resolve("manifest.json");
        Files.writeString(manifest, Files.readString(manifest).replace("\"epochs\":4", "\"epochs\":5"));
        assertEquals(study.resolve(twoArms().path(1, 1)) + ": total_updates: is 20; the study's training gives 25"
                + " updates (5 epochs of 5); " + remedy(study),
                assertThrows(BadInputException.class, () -> StudyReader.read(study)).getMessage());
    }

    @Test
    void aFormatOneDirectoryGetsOneClearLineAndNoNumber() throws Exception {
        SyntheticStudy old = twoArms();
        old.format = 1;
        Path study = old.write(dir.resolve("old"));
        String expected = study.resolve("manifest.json") + ": this study directory is in format 1, written by an"
                + " earlier settle whose tail metrics came from snapshots and whose reshuffling prediction was"
                + " approximate; rerun it with `settle run " + study.resolve("plan.yaml") + " --out " + study
                + " --fresh` to rewrite it in format 4";
        assertEquals(expected, assertThrows(BadInputException.class, () -> StudyReader.read(study)).getMessage());
        assertEquals(expected, assertThrows(BadInputException.class, () -> Report.write(study)).getMessage());
        assertFalse(Files.exists(study.resolve("report.html")), "no report from numbers that mean something else");
        assertFalse(Files.exists(study.resolve("summary.csv")));

        // A format-1 replicate file left in a format-4 directory is refused by name: settle run trains it again.
        Path mixed = twoArms().write(dir.resolve("mixed"));
        Path file = mixed.resolve(twoArms().path(2, 1));
        Files.writeString(file, Files.readString(file).replace("\"format\":4", "\"format\":1"));
        String message = assertThrows(BadInputException.class, () -> StudyReader.read(mixed)).getMessage();
        assertEquals(file + ": format: this file is in format 1; this settle reads format 4; " + remedy(mixed),
                message);
    }

    @Test
    void aFormatTwoDirectoryGetsOneClearLine() throws Exception {
        SyntheticStudy old = twoArms();
        old.format = 2;
        Path study = old.write(dir.resolve("two"));
        String expected = study.resolve("manifest.json") + ": this study directory is in format 2, written by an"
                + " earlier settle whose replicate files hold every array as JSON text (format 4 keeps the large"
                + " arrays in a compact binary file beside each, a fifth of the bytes); rerun it with `settle run "
                + study.resolve("plan.yaml") + " --out " + study + " --fresh` to rewrite it in format 4";
        assertEquals(expected, assertThrows(BadInputException.class, () -> StudyReader.read(study)).getMessage());
        assertFalse(Files.exists(study.resolve("report.html")));
    }

    @Test
    void aFormatThreeDirectoryGetsOneClearLine() throws Exception {
        SyntheticStudy old = twoArms();
        old.format = 3;
        Path study = old.write(dir.resolve("three"));
        String expected = study.resolve("manifest.json") + ": this study directory is in format 3, written by an"
                + " earlier settle whose arm directories are named by the arms' positions in the plan and whose"
                + " binary files hold every array as float64 (format 4 names each arm's directory by its"
                + " specification, so that a study can grow, and codes the arrays compactly, about half the bytes);"
                + " rerun it with `settle run "
                + study.resolve("plan.yaml") + " --out " + study + " --fresh` to rewrite it in format 4";
        assertEquals(expected, assertThrows(BadInputException.class, () -> StudyReader.read(study)).getMessage());
        assertEquals(expected, assertThrows(BadInputException.class, () -> Report.write(study)).getMessage());
        assertFalse(Files.exists(study.resolve("report.html")));
    }

    @Test
    void readsTheFormatTwoPredictionTailAndEpochEndMetrics() throws Exception {
        SyntheticStudy s = twoArms();
        s.momentum = 0.5;
        SyntheticStudy.Rep r = s.replicates.get(0).get(1);
        r.finalBiasSq = 0.25;
        r.finalBall = 0.75;
        r.metrics.put("tail_distance_epoch_ends", 0.125);
        SyntheticStudy.Rep unstable = s.replicates.get(1).get(0);
        unstable.unstableFrom = 7;
        unstable.unstableProduct = 3.5;
        Study study = StudyReader.read(s.write(dir.resolve("s")));

        Replicate one = study.replicate(0, 1);
        assertEquals(0.125, one.metric(Metric.TAIL_DISTANCE_EPOCH_ENDS));
        assertEquals(0.55, one.metric(Metric.TAIL_RADIUS_EPOCH_ENDS), "the fixture sets half the tail radius 1.1");
        assertEquals(19, one.tail().firstUpdate());
        assertEquals(2, one.tail().length());
        assertEquals(1, one.tail().epochEnds());
        Prediction p = one.prediction();
        assertTrue(p.predicted() && p.stable());
        assertEquals("first-order", p.kind());
        assertEquals("shuffle", p.sampling());
        assertEquals(0.5, p.momentum());
        assertEquals(3.0, p.stabilityLimit());
        assertEquals(3.0 / 0.3, p.stabilityBound(), 1e-12);
        assertEquals(0, p.unstableFromUpdate());
        assertEquals(0.25, p.finalBiasSq());
        assertEquals(0.75, p.finalBall());
        assertEquals(1.0, p.finalDistanceSq());
        assertEquals(0.05, p.tailDistanceSq());
        assertEquals(0.04, p.tailDistanceSqEpochEnds());
        assertEquals(2, p.tailUpdates());
        assertEquals(1, p.tailEpochEnds());
        assertEquals(0.04, p.fixedPoint().distanceSqEpochEnd());
        assertTrue(p.fixedPoint().exists());

        Prediction q = study.replicate(1, 0).prediction();
        assertFalse(q.stable());
        assertEquals(7, q.unstableFromUpdate());
        assertEquals(3.5, q.unstableRateTimesCurvature());
        assertEquals(2, q.unstableEpoch(5), "update 7 lies in epoch 2 of 5 updates each");
        assertTrue(Double.isNaN(q.tailDistanceSq()), "null when unstable");
        assertTrue(Double.isNaN(q.epochDistanceSq()[1]) && Double.isFinite(q.epochDistanceSq()[0]));
        assertFalse(study.replicate(1, 2).prediction().predicted(), "the diverged replicate has none");
        assertNull(study.replicate(1, 2).tail());
    }

    /** A predicted noise ball must say whether it stayed stable; a file without {@code stable} is refused by name. */
    @Test
    void aPredictionWithoutItsStabilityIsRefused() throws Exception {
        Path study = twoArms().write(dir.resolve("s"));
        Path file = study.resolve(twoArms().path(1, 1));
        ObjectMapper mapper = new ObjectMapper();
        ObjectNode root = (ObjectNode) mapper.readTree(file.toFile());
        ((ObjectNode) root.get("prediction")).remove("stable");
        mapper.writeValue(file.toFile(), root);
        assertEquals(file + ": prediction.stable: missing; every 'prediction' has it; " + remedy(study),
                assertThrows(BadInputException.class, () -> StudyReader.read(study)).getMessage());
    }

    @Test
    void aReplicateFileInTheWrongPlaceIsRefused() throws Exception {
        Path study = twoArms().write(dir.resolve("s"));
        Files.copy(study.resolve(twoArms().path(1, 1)), study.resolve(twoArms().path(1, 3)),
                java.nio.file.StandardCopyOption.REPLACE_EXISTING);
        assertEquals(study.resolve(twoArms().path(1, 3)) + ": replicate: the file holds arm '" + twoArms().armId(1) + "' replicate 1; its"
                + " path says arm '" + twoArms().armId(1) + "' replicate 3; " + remedy(study),
                assertThrows(BadInputException.class, () -> StudyReader.read(study)).getMessage());
    }
}
