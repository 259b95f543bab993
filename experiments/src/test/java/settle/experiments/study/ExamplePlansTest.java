package settle.experiments.study;

import static org.junit.jupiter.api.Assertions.assertArrayEquals;
import static org.junit.jupiter.api.Assertions.assertEquals;

import java.io.PrintWriter;
import java.io.StringWriter;
import java.nio.file.Files;
import java.nio.file.Path;
import org.junit.jupiter.api.io.TempDir;
import org.junit.jupiter.params.ParameterizedTest;
import org.junit.jupiter.params.provider.ValueSource;
import settle.experiments.cli.Main;

/**
 * Every example plan under experiments/plans runs at a reduced budget into a valid study directory, and gives
 * the same files byte for byte whether the arms that share their mini-batches train together or apart.
 */
class ExamplePlansTest {

    @TempDir
    Path dir;

    @ParameterizedTest
    @ValueSource(strings = {"demo", "wdbc", "wine", "satellite", "housevotes84", "mlp", "grid"})
    void examplePlanRunsAtAReducedBudgetIntoAValidStudyDirectory(String name) throws Exception {
        String text = Files.readString(Path.of("plans", name + ".yaml"));
        String reduced = text.replaceFirst("(?m)^replicates: \\d+$", "replicates: 2")
                .replaceFirst("(?m)^  epochs: \\d+$", "  epochs: 3");
        Path plan = dir.resolve(name + ".yaml");
        Files.writeString(plan, reduced);
        Path study = dir.resolve("study");
        StringWriter err = new StringWriter();
        int code = Main.run(new PrintWriter(new StringWriter()), new PrintWriter(err), "run", plan.toString(), "--out",
                study.toString(), "--quiet");
        assertEquals(0, code, err.toString());
        StudySchema.validate(study);

        Path apart = dir.resolve("apart");
        StringWriter errApart = new StringWriter();
        assertEquals(0, Main.run(new PrintWriter(new StringWriter()), new PrintWriter(errApart), "run", plan.toString(),
                "--out", apart.toString(), "--quiet", "--arms-apart"), errApart.toString());
        StudyFiles.assertSameReplicateFiles(study, apart);
        for (String file : new String[] {"epochs.csv", "summary.csv"}) {
            assertArrayEquals(Files.readAllBytes(study.resolve(file)), Files.readAllBytes(apart.resolve(file)), file);
        }
        if (Files.exists(study.resolve("reference.json"))) {
            assertArrayEquals(Files.readAllBytes(study.resolve("reference.json")),
                    Files.readAllBytes(apart.resolve("reference.json")), "reference.json");
        }
    }

    @org.junit.jupiter.api.Test
    void theDemosArmsTrainTogetherOneUnitPerReplicateAndApartOneUnitPerArmAndReplicate() throws Exception {
        StudyContext context = StudyContext.build(settle.experiments.plan.PlanParser.read(Path.of("plans", "demo.yaml")));
        var keys = context.keys();
        int arms = context.plan().arms().size();
        int replicates = context.plan().replicates();
        var together = StudyRunner.units(context, keys, true);
        assertEquals(replicates, together.size());
        for (int k = 0; k < replicates; k++) {
            assertEquals(arms, together.get(k).size());
            for (var key : together.get(k)) {
                assertEquals(k + 1, key.replicate());
            }
        }
        assertEquals(keys.size(), StudyRunner.units(context, keys, false).size());
    }
}
