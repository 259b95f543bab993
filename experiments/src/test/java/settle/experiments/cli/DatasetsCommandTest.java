package settle.experiments.cli;

import static org.junit.jupiter.api.Assertions.assertEquals;
import static org.junit.jupiter.api.Assertions.assertTrue;

import java.io.PrintWriter;
import java.io.StringWriter;
import org.junit.jupiter.api.Test;

class DatasetsCommandTest {

    @Test
    void listsTheBundledSetWithProvenance() {
        StringWriter out = new StringWriter();
        StringWriter err = new StringWriter();
        int code = Main.run(new PrintWriter(out), new PrintWriter(err), "datasets");
        assertEquals(Main.OK, code, err.toString());
        String text = out.toString();
        for (String name : new String[] {"wdbc  Breast Cancer Wisconsin (Diagnostic)", "wine  Wine",
                "satellite  Statlog (Landsat Satellite)", "housevotes84  Congressional Voting Records (1984)"}) {
            assertTrue(text.contains("\n" + name), name);
        }
        assertTrue(text.contains("rows      569, features 30"));
        assertTrue(text.contains("classes   2: benign 357, malignant 212 (class 1, the positive class: malignant)"));
        assertTrue(text.contains("classes   3: cultivar 1 59, cultivar 2 71, cultivar 3 48"));
        assertTrue(text.contains("rows      6435, features 36, label column 'cover'"));
        assertTrue(text.contains("rows      435, input columns 16 (392 missing cells; a table: the data.* column keys "
                + "apply), label column 'party'"));
        assertTrue(text.contains("classes   2: democrat 267, republican 168 (class 1, the positive class: republican)"));
        assertTrue(text.contains("licensed CC BY 4.0"));
        assertTrue(text.contains("Machine Learning, Neural and Statistical Classification"));
        assertEquals(4, text.split("\\(verified\\)", -1).length - 1);
    }
}
