package settle.reports.format;

import static org.junit.jupiter.api.Assertions.assertEquals;

import org.junit.jupiter.api.Test;

/**
 * The training block of a resolved plan.yaml: read from its canonical form (two-space keys under {@code training:},
 * up to the next top-level key), and absent, never an error, when the text is not in that form. That the runner's
 * plan.yaml is read right is checked on real studies in {@code CompareCommandTest}.
 */
class ResolvedPlanTest {

    @Test
    void theTrainingBlockOfTheResolvedForm() {
        String text = "# resolved plan\nstudy: s\nseed: 1\nreplicates: 4\ndata:\n  source: bundled:wine\n  batch: 99\n"
                + "model:\n  kind: logistic\ntraining:\n  epochs: 60\n  batch: 16\n  sampling: replacement\n"
                + "  momentum: 0.0\nbaseline: constant\narms:\n  - name: constant\n    schedule: {kind: constant}\n";
        ResolvedPlan p = ResolvedPlan.training(text);
        assertEquals(60, p.epochs());
        assertEquals(16, p.batch(), "the training block's batch, not a key of the same name elsewhere");
        assertEquals("replacement", p.sampling());
        assertEquals("0.0", p.values().get("momentum"));
        assertEquals(4, p.values().size(), "nothing after the block: " + p.values());
    }

    @Test
    void otherTextGivesAnEmptyBlock() {
        for (String text : new String[] {"", "study: s\n", "training: {epochs: 3, batch: 8}\n",
            "training:\n  batch: -3\n  epochs: many\n"}) {
            ResolvedPlan p = ResolvedPlan.training(text);
            assertEquals(0, p.batch(), text);
            assertEquals(0, p.epochs(), text);
            assertEquals("", p.sampling(), text);
        }
    }
}
