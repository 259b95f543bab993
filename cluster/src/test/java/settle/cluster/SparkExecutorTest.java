package settle.cluster;

import static org.junit.jupiter.api.Assertions.assertArrayEquals;
import static org.junit.jupiter.api.Assertions.assertEquals;
import static org.junit.jupiter.api.Assertions.assertFalse;
import static org.junit.jupiter.api.Assertions.assertThrows;
import static org.junit.jupiter.api.Assertions.assertTrue;

import java.io.StringWriter;
import java.nio.file.Files;
import java.nio.file.Path;
import java.util.ArrayList;
import java.util.List;
import org.apache.spark.TaskContext;
import org.junit.jupiter.api.Test;
import org.junit.jupiter.api.io.TempDir;
import settle.experiments.run.WorkFailedException;
import settle.input.BadInputException;
import settle.experiments.plan.PlanParser;
import settle.experiments.run.ReplicateKey;
import settle.experiments.run.ReplicateOutcome;
import settle.experiments.study.StudyContext;
import settle.experiments.study.StudyRunner;
import settle.reports.format.ReplicateJson;

/** Retries, failures and refusals of {@link SparkExecutor}. */
class SparkExecutorTest {

    private static final ReplicateKey FLAKY = new ReplicateKey(1, 1);
    private static final ReplicateKey BROKEN = new ReplicateKey(2, 2);

    @TempDir
    Path dir;

    /** Fails the first attempt of {@link #FLAKY} and every attempt of {@link #BROKEN}; trains the rest. */
    private static final class FaultyBody implements SparkExecutor.TaskBody {
        private static final long serialVersionUID = 1L;

        @Override
        public ArrayList<ReplicateOutcome> train(StudyContext context, List<ReplicateKey> unit) {
            int attempt = TaskContext.get().attemptNumber();
            ArrayList<ReplicateOutcome> outcomes = new ArrayList<>();
            for (ReplicateKey key : unit) {
                if (key.equals(FLAKY) && attempt == 0) {
                    throw new IllegalStateException("injected failure of the first attempt of " + key);
                }
                if (key.equals(BROKEN)) {
                    throw new IllegalStateException("injected failure of attempt " + attempt + " of " + key);
                }
            }
            StudyRunner.outcomes(context, unit, outcomes::add);
            return outcomes;
        }
    }

    private StudyContext context(String extraArm) {
        return StudyContext.build(PlanParser.read(Studies.convexPlan("executor", extraArm), "plan.yaml", dir));
    }

    @Test
    void aFailedTaskIsRetriedAndEveryReplicateReachesTheSinkOnceWithTheLocalBytes() throws Exception {
        StudyContext context = context("");
        List<ReplicateKey> keys = new ArrayList<>(context.keys());
        keys.remove(BROKEN);
        List<ReplicateOutcome> received = new ArrayList<>();
        // local[2,2]: two threads, two attempts per task (local[2] alone allows one)
        try (SparkExecutor spark = new SparkExecutor("local[2,2]", context, new FaultyBody())) {
            // the first attempt of FLAKY always fails, so the run only completes if Spark retried it
            // units of work as a run makes them: replicate k of the arms that share their mini-batches together
            List<List<ReplicateKey>> units = StudyRunner.units(context, keys, true);
            assertTrue(units.size() < keys.size(), "some arms train together");
            spark.runAll(units, (unit, each) -> StudyRunner.outcomes(context, unit, each), received::add);
            assertEquals(keys.size(), received.size());
            assertEquals(keys.size(), received.stream().map(ReplicateOutcome::key).distinct().count(),
                    "a replicate reached the sink twice");
            for (ReplicateOutcome o : received) {
                ReplicateJson.Written local = StudyRunner.outcome(context, o.key()).file();
                assertArrayEquals(local.json(), o.file().json(), o.key().toString());
                assertArrayEquals(local.binary(), o.file().binary(), o.key() + " binary file");
            }

            received.clear();
            WorkFailedException failed = assertThrows(WorkFailedException.class,
                    () -> spark.runAll(List.of(List.of(BROKEN)), (unit, each) -> StudyRunner.outcomes(context, unit, each),
                            received::add));
            assertTrue(received.isEmpty());
            String message = failed.getMessage();
            assertFalse(message.contains("\n"), message);
            assertTrue(message.startsWith("the Spark job failed after 0 of 1 replicates: "), message);
            assertTrue(message.contains("failed 2 times"), message);
            assertTrue(message.contains("injected failure of attempt 1 of arm 2 replicate 2"), message);
        }
    }

    @Test
    void manualArmsAreRefusedBeforeSparkStarts() throws Exception {
        String manual = String.join("\n", "  - name: by-hand", "    schedule: {kind: constant, rate: 0.3}",
                "    manual: true");
        BadInputException refused = assertThrows(BadInputException.class, () -> new SparkExecutor("local[2]", context(manual)));
        assertTrue(refused.getMessage().contains("arms[3].manual"), refused.getMessage());

        Path plan = dir.resolve("manual.yaml");
        Files.writeString(plan, Studies.convexPlan("manual", manual));
        StringWriter err = new StringWriter();
        Path study = dir.resolve("s");
        assertEquals(2, Studies.settle(new StringWriter(), err, "run", plan.toString(), "--cluster", "local[2]", "--out",
                study.toString(), "--quiet"));
        // line 27 of the plan is "    manual: true"; its value starts in column 13
        assertEquals(plan + ":27:13: arms[3].manual: arm 'by-hand' is manual, and a cluster run cannot take nudges; "
                + "run this plan without --cluster, or set manual: false", err.toString().trim());
        assertFalse(Files.exists(study));
    }

    @Test
    void aMasterSparkCannotReadIsBadInputInOneLine() throws Exception {
        Path plan = dir.resolve("plan.yaml");
        Files.writeString(plan, Studies.convexPlan("bad-master", ""));
        StringWriter err = new StringWriter();
        assertEquals(2, Studies.settle(new StringWriter(), err, "run", plan.toString(), "--cluster", "nowhere:7077",
                "--out", dir.resolve("s").toString(), "--quiet"));
        assertEquals("settle run: --cluster nowhere:7077: Could not parse Master URL: 'nowhere:7077'", err.toString().trim());
    }
}
