package settle.experiments.study;

import static org.junit.jupiter.api.Assertions.assertEquals;

import java.io.PrintWriter;
import java.io.StringWriter;
import java.nio.file.Files;
import java.nio.file.Path;
import org.junit.jupiter.api.io.TempDir;
import org.junit.jupiter.params.ParameterizedTest;
import org.junit.jupiter.params.provider.ValueSource;
import settle.experiments.cli.Main;

/** Every example plan under experiments/plans runs at a reduced budget into a study directory of format 2. */
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
    }
}
