package settle.experiments.study;

import static org.junit.jupiter.api.Assertions.assertEquals;

import java.io.StringWriter;
import java.nio.file.Files;
import java.nio.file.Path;
import java.util.ArrayList;
import java.util.List;
import org.junit.jupiter.api.Test;
import org.junit.jupiter.api.io.TempDir;
import settle.engine.train.Sampling;
import settle.engine.train.TrainingSettings;
import settle.experiments.plan.Defaults;
import settle.reports.format.Manifest;
import settle.reports.format.StudyReader;

/**
 * The manifest's {@code training} is the plan's training settings as the runner used them: every key the plan gives,
 * and the defaults of those it leaves out; and every sampling the engine has is one the manifest's reader accepts.
 */
class ManifestTrainingTest {

    @TempDir
    Path dir;

    private Manifest run(String name, String training) throws Exception {
        Path plan = dir.resolve(name + ".yaml");
        Files.writeString(plan, String.join("\n",
                "study: " + name,
                "replicates: 2",
                "data:",
                "  source: synthetic:gaussian?rows=60&features=2&classes=2&separation=1.5&seed=3",
                "model:",
                "  kind: logistic",
                training,
                "arms:",
                "  - name: constant",
                "    schedule: {kind: constant, rate: 0.2}",
                ""));
        Path study = dir.resolve(name);
        StringWriter err = new StringWriter();
        assertEquals(0, StudyRunnerTest.settle(new StringWriter(), err, "run", plan.toString(), "--out",
                study.toString(), "--quiet"), err.toString());
        return StudyReader.read(study).manifest();
    }

    @Test
    void theManifestRecordsTheTrainingKeysAsThePlanGivesThem() throws Exception {
        Manifest m = run("given", String.join("\n", "training:", "  epochs: 3", "  batch: 5", "  sampling: replacement",
                "  momentum: 0.5", "  tail: 0.25", "  snapshots: 4"));
        assertEquals(new Manifest.Training(3, 5, "replacement", 0.5, 0.25, 4), m.training());
        // 48 training rows (a fifth of 60 is the test split) in batches of 5: ⌈48/5⌉ = 10 updates an epoch
        assertEquals(10, m.updatesPerEpoch());
        assertEquals(30, m.plannedUpdates());
    }

    @Test
    void keysLeftOutAreRecordedWithTheirDefaults() throws Exception {
        Manifest m = run("defaults", "training:\n  epochs: 2");
        assertEquals(new Manifest.Training(2, Defaults.BATCH, Defaults.SAMPLING.key(), Defaults.MOMENTUM,
                Defaults.TAIL, Defaults.SNAPSHOTS), m.training());
    }

    @Test
    void everySamplingOfTheEngineIsOneTheManifestRecords() {
        List<String> keys = new ArrayList<>();
        for (Sampling s : Sampling.values()) {
            keys.add(s.key());
            Manifest.Training t = StudyRunner.training(new TrainingSettings(1, 1, s, 0, 1, 1, false));
            assertEquals(s.key(), t.sampling());
        }
        assertEquals(keys, Manifest.Training.SAMPLINGS, "the same words in the same order");
    }
}
