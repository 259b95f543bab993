package settle.reports.format;

import java.io.IOException;
import java.nio.charset.CharacterCodingException;
import java.nio.charset.StandardCharsets;
import java.nio.file.Files;
import java.nio.file.Path;
import java.util.ArrayList;
import java.util.List;
import settle.input.BadInputException;

/**
 * {@code nudges.csv}: every nudge applied to a manual arm, in the order applied, one row each (the {@link Csv} codec:
 * RFC 4180, CRLF, UTF-8, a header row). It is the record a resumed run replays and {@code replay.yaml} is built
 * from; the runner rewrites it whole and atomically after each nudge, and the report marks the nudges from it.
 */
public final class NudgesCsv {

    /** The header row. */
    public static final String HEADER = "arm_index,arm,from_epoch,factor,rate,note,time,request";

    private static final int COLUMNS = 8;
    /** A decimal number as {@link Csv#number} writes one. */
    private static final java.util.regex.Pattern DECIMAL =
            java.util.regex.Pattern.compile("-?([0-9]+(\\.[0-9]*)?|\\.[0-9]+)([eE][-+]?[0-9]+)?");

    private NudgesCsv() {
    }

    /** Writes every nudge of {@code rows} into {@code study}'s nudges.csv, atomically. */
    public static void write(Path study, List<NudgeRecord> rows) throws IOException {
        StringBuilder b = new StringBuilder(HEADER).append(Csv.LINE_END);
        for (NudgeRecord n : rows) {
            b.append(Csv.line(Integer.toString(n.armIndex()), Csv.text(n.arm()), Integer.toString(n.fromEpoch()),
                    Csv.number(n.factor()), Csv.number(n.rate()), Csv.text(n.note()), Csv.text(n.time()),
                    Csv.text(n.request())));
        }
        AtomicFile.write(study.resolve(StudyFormat.NUDGES), b.toString());
    }

    /**
     * @return the nudges recorded in {@code study}, in order; empty when there is no nudges.csv
     * @throws BadInputException naming the file, line and column when it is not in this format
     */
    public static List<NudgeRecord> read(Path study) throws IOException {
        Path file = study.resolve(StudyFormat.NUDGES);
        List<NudgeRecord> out = new ArrayList<>();
        if (!Files.isRegularFile(file)) {
            return out;
        }
        String name = file.toString();
        String text;
        try {
            text = StandardCharsets.UTF_8.newDecoder().decode(java.nio.ByteBuffer.wrap(Files.readAllBytes(file)))
                    .toString();
        } catch (CharacterCodingException e) {
            throw BadInputException.inFile(name, "", "not UTF-8 text; expected the nudges settle recorded");
        }
        List<Csv.Record> records = Csv.read(text, name);
        if (records.isEmpty() || !String.join(",", records.get(0).fields()).equals(HEADER)) {
            throw BadInputException.at(name, 1, 0, "", "expected the header " + HEADER);
        }
        for (int i = 1; i < records.size(); i++) {
            Csv.Record r = records.get(i);
            List<String> f = r.fields();
            if (f.size() != COLUMNS) {
                throw BadInputException.at(name, r.line(), 0, "", f.size() + " fields; expected " + COLUMNS + " ("
                        + HEADER + ")");
            }
            out.add(new NudgeRecord(whole(name, r, 0, "arm_index"), Csv.unguard(f.get(1)), whole(name, r, 2,
                    "from_epoch"), number(name, r, 3, "factor", true), number(name, r, 4, "rate", false),
                    Csv.unguard(f.get(5)), Csv.unguard(f.get(6)), Csv.unguard(f.get(7))));
        }
        return out;
    }

    private static int whole(String file, Csv.Record r, int column, String key) {
        String v = r.fields().get(column);
        try {
            int n = Integer.parseInt(v);
            if (n >= 1) {
                return n;
            }
        } catch (NumberFormatException e) {
            // refused below
        }
        throw BadInputException.at(file, r.line(), column + 1, key, "must be a whole number ≥ 1, not "
                + BadInputException.shown(v));
    }

    private static double number(String file, Csv.Record r, int column, String key, boolean positive) {
        String v = r.fields().get(column);
        if (DECIMAL.matcher(v).matches()) {
            double x = Double.parseDouble(v);
            if (Double.isFinite(x) && (positive ? x > 0 : x >= 0)) {
                return x;
            }
        }
        throw BadInputException.at(file, r.line(), column + 1, key, "must be a number " + (positive ? "> 0" : "≥ 0")
                + ", not " + BadInputException.shown(v));
    }
}
