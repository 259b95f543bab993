package settle.experiments.study;

import static org.junit.jupiter.api.Assertions.assertEquals;
import static org.junit.jupiter.api.Assertions.assertFalse;

import com.fasterxml.jackson.databind.JsonNode;
import com.fasterxml.jackson.databind.ObjectMapper;
import java.io.StringWriter;
import java.nio.file.Files;
import java.nio.file.Path;
import java.util.ArrayList;
import java.util.List;
import org.junit.jupiter.api.Test;
import org.junit.jupiter.api.io.TempDir;

/** The plateau cuts a replicate file records are exactly the epochs where its plateau rate dropped. */
class PlateauCutsTest {

    private static final ObjectMapper MAPPER = new ObjectMapper();

    @TempDir
    Path dir;

    @Test
    void theRecordedCutsAreWhereTheRateDrops() throws Exception {
        Path planFile = dir.resolve("plateau.yaml");
        Files.writeString(planFile, String.join("\n",
                "study: plateau",
                "seed: 5",
                "replicates: 3",
                "data:",
                "  source: synthetic:gaussian?rows=200&features=3&classes=2&separation=1.0&seed=2",
                "model:",
                "  kind: logistic",
                "training:",
                "  epochs: 12",
                "  batch: 16",
                "  snapshots: 5",
                "arms:",
                "  - name: plateau",
                "    schedule: {kind: plateau, rate: 0.5, cut: 0.5, window: 1, gain: 5%}",
                "  - name: constant",
                "    schedule: {kind: constant, rate: 0.5}",
                ""));
        Path study = dir.resolve("study");
        assertEquals(0, StudyRunnerTest.settle(new StringWriter(), new StringWriter(), "run", planFile.toString(),
                "--out", study.toString(), "--quiet"));
        StudySchema.validate(study);
        int cutsSeen = 0;
        for (int r = 1; r <= 3; r++) {
            JsonNode rep = StudyFiles.replicate(StudyFiles.arm(study, 1).resolve(r + ".json"));
            JsonNode rates = rep.path("epochs").path("rate");
            // without warmup a plateau rate is constant within an epoch and between cuts: a cut is a drop
            List<Integer> drops = new ArrayList<>();
            List<Double> dropRates = new ArrayList<>();
            for (int e = 2; e <= rates.size(); e++) {
                if (rates.get(e - 1).asDouble() < rates.get(e - 2).asDouble()) {
                    drops.add(e);
                    dropRates.add(rates.get(e - 1).asDouble());
                }
            }
            List<Integer> recorded = new ArrayList<>();
            List<Double> recordedRates = new ArrayList<>();
            for (JsonNode cut : rep.path("plateau_cuts")) {
                recorded.add(cut.path("from_epoch").asInt());
                recordedRates.add(cut.path("rate").asDouble());
            }
            assertEquals(drops, recorded, "replicate " + r);
            assertEquals(dropRates, recordedRates, "replicate " + r);
            cutsSeen += recorded.size();
            JsonNode constant = StudyFiles.replicate(StudyFiles.arm(study, 2).resolve(r + ".json"));
            assertEquals(0, constant.path("plateau_cuts").size());
        }
        assertFalse(cutsSeen == 0, "the plan is meant to cut: window 1 with a 5 % gain");
    }
}
