package settle.reports.format;

import static org.junit.jupiter.api.Assertions.assertEquals;

import java.nio.file.Files;
import java.nio.file.Path;
import java.util.List;
import org.junit.jupiter.api.Test;
import org.junit.jupiter.api.io.TempDir;
import settle.input.BadInputException;

/**
 * The one CSV codec: RFC 4180 quoting, text cells a spreadsheet reads as text (the guard is the common practice
 * against CSV injection: an apostrophe in front of a cell that starts with =, +, - or @), numbers never guarded, and
 * every text read back as written.
 */
class CsvTest {

    @TempDir
    Path dir;

    @Test
    void textCellsThatAFormulaCouldStartWithAreGuardedAndReadBack() {
        assertEquals("\"'=HYPERLINK(\"\"http://x\"\")\"", Csv.text("=HYPERLINK(\"http://x\")"));
        assertEquals("'+1", Csv.text("+1"));
        assertEquals("'-2", Csv.text("-2"));
        assertEquals("'@SUM(A1)", Csv.text("@SUM(A1)"));
        assertEquals("''quoted", Csv.text("'quoted"), "an apostrophe is doubled so that reading undoes the guard");
        assertEquals("constant", Csv.text("constant"));
        assertEquals("\"a,b\"", Csv.text("a,b"));
        assertEquals("-0.5", Csv.number(-0.5), "numbers are never guarded");
        assertEquals("", Csv.number(Double.NaN), "does not apply");
        for (String s : List.of("=1+1", "+x", "-x", "@x", "'x", "''x", "'", "x'", "a,\"b\"\r\nc", "", "plain")) {
            String line = Csv.line(Csv.text(s), Csv.number(1.5));
            List<Csv.Record> read = Csv.read(line, "t.csv");
            assertEquals(1, read.size(), line);
            assertEquals(s, Csv.unguard(read.get(0).fields().get(0)), "round trip of " + s);
            assertEquals("1.5", read.get(0).fields().get(1));
        }
    }

    @Test
    void nudgesReadBackAsWritten() throws Exception {
        List<NudgeRecord> rows = List.of(new NudgeRecord(1, "=cmd|' /C calc'!A0", 3, 0.5, 0.05, "-halve, \"now\"",
                "2026-12-05T10:00:00Z", "r1"), new NudgeRecord(2, "'quoted", 4, 2.0, 1e23, "@note", "", "r2"));
        NudgesCsv.write(dir, rows);
        assertEquals(rows, NudgesCsv.read(dir));
        String text = Files.readString(dir.resolve(StudyFormat.NUDGES));
        assertEquals(NudgesCsv.HEADER + "\r\n1,'=cmd|' /C calc'!A0,3,0.5,0.05,\"'-halve, \"\"now\"\"\","
                + "2026-12-05T10:00:00Z,r1\r\n2,''quoted,4,2.0,1.0E23,'@note,,r2\r\n", text);
    }

    @Test
    void anUnclosedQuoteIsRefusedWithItsLine() {
        BadInputException e = org.junit.jupiter.api.Assertions.assertThrows(BadInputException.class,
                () -> Csv.read("a,b\r\n\"open,c\r\n", "n.csv"));
        assertEquals("n.csv:2: a quoted field is not closed; expected a closing quote (the file may be cut short)",
                e.getMessage());
    }
}
