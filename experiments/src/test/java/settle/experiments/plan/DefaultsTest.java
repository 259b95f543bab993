package settle.experiments.plan;

import static org.junit.jupiter.api.Assertions.assertEquals;
import static org.junit.jupiter.api.Assertions.assertTrue;

import java.io.IOException;
import java.nio.charset.StandardCharsets;
import java.nio.file.Files;
import java.nio.file.Path;
import java.util.Map;
import org.junit.jupiter.api.Test;
import settle.engine.train.TrainingSettings;

/** The one table of defaults: what the parser fills in, what the options default to and what the docs print. */
class DefaultsTest {

    @Test
    void theDocsPrintTheTable() throws IOException {
        for (String doc : new String[] {"../docs/plans.md", "../README.md"}) {
            String text = Files.readString(Path.of(doc), StandardCharsets.UTF_8);
            assertTrue(text.contains(Defaults.TABLE), doc + " should hold Defaults.TABLE as it is:\n" + Defaults.TABLE);
        }
    }

    @Test
    void aPlanWithOnlyItsSourceAndOneArmTakesTheTable() {
        Plan plan = PlanParser.read("data: {source: 'bundled:wine'}\narms:\n  - schedule: {kind: constant, rate: 0.1}\n",
                "p.yaml", Path.of("")).plan();
        assertEquals(Defaults.SEED, plan.seed());
        assertEquals(Defaults.REPLICATES, plan.replicates());
        assertEquals(Defaults.TEST_FRACTION, plan.data().testFraction());
        assertEquals(Defaults.HOLDOUT_FRACTION, plan.data().holdoutFraction());
        assertEquals(Defaults.STANDARDIZE, plan.data().standardize());
        assertEquals(Defaults.MODEL, plan.model().kind());
        assertEquals(Defaults.L2, plan.model().l2());
        assertEquals(new TrainingSettings(Defaults.EPOCHS, Defaults.BATCH, Defaults.SAMPLING, Defaults.MOMENTUM,
                Defaults.TAIL, Defaults.SNAPSHOTS, false), plan.training());
    }

    @Test
    void theOptionsDefaultsAreTheTables() {
        Map<String, String> expected = Map.of("--l2", "1.0e-3", "--epochs", "50", "--batch", "32", "--test-fraction",
                "0.2", "--standardize", "true", "--model", "logistic", "--sampling", "shuffle", "--seed", "1");
        expected.forEach((option, text) -> assertEquals(text, Defaults.option(option), option));
        assertEquals(Defaults.L2, Double.parseDouble(Defaults.option("--l2")));
        assertEquals(null, Defaults.option("--data"));
    }
}
