package settle.experiments.cli;

import static org.junit.jupiter.api.Assertions.assertEquals;
import static org.junit.jupiter.api.Assertions.assertTrue;

import java.io.PrintWriter;
import java.io.StringWriter;
import org.junit.jupiter.api.Test;

class DatasetsCommandTest {

    @Test
    void listsTheFourWithProvenance() {
        StringWriter out = new StringWriter();
        StringWriter err = new StringWriter();
        int code = Main.run(new PrintWriter(out), new PrintWriter(err), "datasets");
        assertEquals(Main.OK, code, err.toString());
        String text = out.toString();
        for (String name : new String[] {"wdbc  Breast Cancer Wisconsin (Diagnostic)", "iris  Iris", "wine  Wine",
                "optdigits  Optical Recognition of Handwritten Digits"}) {
            assertTrue(text.contains("\n" + name), name);
        }
        assertTrue(text.contains("rows      569, features 30"));
        assertTrue(text.contains("classes   2: benign 357, malignant 212 (class 1, the positive class: malignant)"));
        assertTrue(text.contains("classes   3: class_0 59, class_1 71, class_2 48"));
        assertTrue(text.contains("licensed CC BY 4.0"));
        assertTrue(text.contains("Annals of Eugenics"));
        assertEquals(4, text.split("\\(verified\\)", -1).length - 1);
    }
}
