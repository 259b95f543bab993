package settle.reports;

import static org.junit.jupiter.api.Assertions.assertEquals;
import static org.junit.jupiter.api.Assertions.assertNotNull;
import static org.junit.jupiter.api.Assertions.assertNull;
import static org.junit.jupiter.api.Assertions.assertThrows;
import static org.junit.jupiter.api.Assertions.assertTrue;

import java.nio.file.Files;
import java.nio.file.Path;
import java.util.List;
import org.junit.jupiter.api.Test;
import org.junit.jupiter.api.io.TempDir;
import settle.reports.study.Metric;
import settle.reports.study.Study;
import settle.reports.study.StudyFormatException;
import settle.reports.study.StudyReader;

class StudyReaderTest {

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
        StudyFormatException none = assertThrows(StudyFormatException.class, () -> StudyReader.read(dir.resolve("nope")));
        assertEquals(dir.resolve("nope") + ": no such study directory", none.getMessage());

        Files.createDirectories(dir.resolve("empty"));
        assertTrue(assertThrows(StudyFormatException.class, () -> StudyReader.read(dir.resolve("empty"))).getMessage()
                .contains("not a study directory (no manifest.json"));

        Path study = twoArms().write(dir.resolve("s"));
        Path file = study.resolve("arms/1/2.json");
        Files.writeString(file, "{\"format\": 1,\n  \"arm\": oops}");
        String message = assertThrows(StudyFormatException.class, () -> StudyReader.read(study)).getMessage();
        assertTrue(message.startsWith(file + ": not valid JSON at line 2, column"), message);
        assertEquals(-1, message.indexOf('\n'), "one line");

        Path manifest = study.resolve("manifest.json");
        Files.writeString(manifest, Files.readString(manifest).replace("\"format\":1", "\"format\":2"));
        assertEquals(manifest + ": study directory format 2 is not supported; this settle reads format 1",
                assertThrows(StudyFormatException.class, () -> StudyReader.read(study)).getMessage());
    }

    @Test
    void aReplicateFileInTheWrongPlaceIsRefused() throws Exception {
        Path study = twoArms().write(dir.resolve("s"));
        Files.copy(study.resolve("arms/1/1.json"), study.resolve("arms/1/3.json"),
                java.nio.file.StandardCopyOption.REPLACE_EXISTING);
        assertEquals(study.resolve("arms/1/3.json") + ": holds arm 1 replicate 1; its path says arm 1 replicate 3",
                assertThrows(StudyFormatException.class, () -> StudyReader.read(study)).getMessage());
    }
}
