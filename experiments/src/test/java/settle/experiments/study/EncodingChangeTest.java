package settle.experiments.study;

import static org.junit.jupiter.api.Assertions.assertEquals;
import static org.junit.jupiter.api.Assertions.assertNull;
import static org.junit.jupiter.api.Assertions.assertThrows;

import java.nio.file.Path;
import java.util.List;
import org.junit.jupiter.api.Test;
import settle.input.BadInputException;
import settle.reports.format.EncodingRecord;

class EncodingChangeTest {

    private static EncodingRecord table(String missing, List<String> levels, String role) {
        List<String> outputs = levels.stream().map(l -> "colour=" + l).toList();
        return new EncodingRecord("csv:t.csv", true, missing, List.of(new EncodingRecord.Input("colour", "text", role,
                0), new EncodingRecord.Input("y", "text", "label", 0)), List.of(new EncodingRecord.Feature("colour",
                EncodingRecord.CATEGORY, levels, false, Double.NaN, false, outputs)), List.of(), new int[0]);
    }

    @Test
    void theSameEncodingIsNoChange() {
        assertNull(EncodingFile.change(table("refuse", List.of("red"), "feature"),
                table("refuse", List.of("red"), "feature")));
    }

    @Test
    void aNewLevelIsNamedWithTheKey() {
        BadInputException e = assertThrows(BadInputException.class, () -> EncodingFile.refuseChanged(Path.of("st"),
                table("refuse", List.of("red"), "feature"), table("refuse", List.of("blue", "red"), "feature")));
        assertEquals("st: data.categorical: column 'colour' now has levels 'blue', 'red' (was 'red'); this study was"
                + " run with the encoding it records in encoding.json: use --fresh to discard its results, or --out DIR"
                + " for a new study", e.getMessage());
    }

    @Test
    void theMissingRuleAndADroppedColumnAreNamed() {
        assertEquals("data.missing", EncodingFile.change(table("refuse", List.of("red"), "feature"),
                table("impute", List.of("red"), "feature"))[0]);
        assertEquals("column 'colour' is now dropped (was a feature)", EncodingFile.change(
                table("refuse", List.of("red"), "feature"), table("refuse", List.of("red"), "dropped"))[1]);
    }

    @Test
    void aStudyWithoutARecordedEncodingIsNotCheckedHere() {
        EncodingFile.refuseChanged(Path.of("st"), null, table("refuse", List.of("red"), "feature"));
    }

    @Test
    void eachChangeNamesTheFieldOfEncodingJsonThatHoldsIt() {
        assertEquals("features[0].levels", EncodingFile.change(table("refuse", List.of("red"), "feature"),
                table("refuse", List.of("blue", "red"), "feature"))[2]);
        assertEquals("missing", EncodingFile.change(table("refuse", List.of("red"), "feature"),
                table("impute", List.of("red"), "feature"))[2]);
        assertEquals("inputs[0].role", EncodingFile.change(table("refuse", List.of("red"), "feature"),
                table("refuse", List.of("red"), "dropped"))[2]);
    }

    @Test
    void aDifferenceUnderAnUnchangedPlanAndDataIsAnEditedFileThatCanBeWrittenAgain() {
        BadInputException e = assertThrows(BadInputException.class, () -> EncodingFile.refuseChanged(Path.of("st"),
                table("refuse", List.of("red"), "feature"), table("refuse", List.of("blue", "red"), "feature"), true));
        assertEquals(Path.of("st", "encoding.json") + ": features[0].levels: does not match the encoding of the plan"
                + " and the data, which are unchanged since the study was run (column 'colour' now has levels 'blue', 'red'"
                + " (was 'red')): the file was edited or damaged; it is made from the plan and the data: delete it, and"
                + " settle run " + Path.of("st", "plan.yaml") + " --out st writes it again, keeping the finished"
                + " replicates", e.getMessage());
    }
}
