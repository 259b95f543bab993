package settle.experiments.manual;

import java.io.IOException;
import java.nio.charset.StandardCharsets;
import java.nio.file.Files;
import java.nio.file.Path;
import java.util.ArrayList;
import java.util.List;
import settle.experiments.study.AtomicFiles;
import settle.experiments.study.EpochsTable;

/**
 * {@code nudges.csv} in a study directory: every nudge applied, in the order applied, one row each
 * (RFC 4180 quoting, UTF-8, a header row). It is the record a resumed run replays and {@code replay.yaml}
 * is built from; the runner rewrites it whole and atomically after each nudge.
 */
public final class NudgesCsv {

    /** The file name in a study directory. */
    public static final String FILE = "nudges.csv";
    /** The header row. */
    public static final String HEADER = "arm_index,arm,from_epoch,factor,rate,note,time,request";

    private static final int COLUMNS = 8;

    private NudgesCsv() {
    }

    /** Writes every nudge of {@code rows} atomically. */
    public static void write(Path study, List<AppliedNudge> rows) throws IOException {
        StringBuilder b = new StringBuilder(HEADER).append("\r\n");
        for (AppliedNudge n : rows) {
            b.append(n.armIndex()).append(',').append(EpochsTable.quote(n.arm())).append(',').append(n.fromEpoch())
                    .append(',').append(n.factor()).append(',').append(n.rate()).append(',')
                    .append(EpochsTable.quote(n.note())).append(',').append(EpochsTable.quote(n.time())).append(',')
                    .append(EpochsTable.quote(n.request())).append("\r\n");
        }
        AtomicFiles.write(study.resolve(FILE), b.toString());
    }

    /**
     * @return the nudges recorded in {@code study}, in order; empty when there is no {@code nudges.csv}
     * @throws IllegalArgumentException naming the file and line when it is not in this format
     */
    public static List<AppliedNudge> read(Path study) throws IOException {
        Path file = study.resolve(FILE);
        List<AppliedNudge> out = new ArrayList<>();
        if (!Files.exists(file)) {
            return out;
        }
        List<List<String>> records = parse(Files.readString(file, StandardCharsets.UTF_8), file);
        if (records.isEmpty() || !String.join(",", records.get(0)).equals(HEADER)) {
            throw new IllegalArgumentException(file + ": line 1: expected the header " + HEADER);
        }
        for (int i = 1; i < records.size(); i++) {
            List<String> r = records.get(i);
            if (r.size() != COLUMNS) {
                throw new IllegalArgumentException(file + ": record " + (i + 1) + ": " + r.size() + " fields, expected "
                        + COLUMNS + " (" + HEADER + ")");
            }
            try {
                out.add(new AppliedNudge(Integer.parseInt(r.get(0)), r.get(1), Integer.parseInt(r.get(2)),
                        Double.parseDouble(r.get(3)), Double.parseDouble(r.get(4)), r.get(5), r.get(6), r.get(7)));
            } catch (IllegalArgumentException e) {
                throw new IllegalArgumentException(file + ": record " + (i + 1) + ": " + e.getMessage());
            }
        }
        return out;
    }

    /** RFC 4180 records: fields split at commas, quoted fields may hold commas, quotes ("") and line breaks. */
    static List<List<String>> parse(String text, Path file) {
        List<List<String>> records = new ArrayList<>();
        List<String> record = new ArrayList<>();
        StringBuilder field = new StringBuilder();
        boolean quoted = false;
        boolean any = false;
        int line = 1;
        for (int i = 0; i < text.length(); i++) {
            char c = text.charAt(i);
            if (quoted) {
                if (c == '"') {
                    if (i + 1 < text.length() && text.charAt(i + 1) == '"') {
                        field.append('"');
                        i++;
                    } else {
                        quoted = false;
                    }
                } else {
                    if (c == '\n') {
                        line++;
                    }
                    field.append(c);
                }
            } else if (c == '"' && field.length() == 0) {
                quoted = true;
                any = true;
            } else if (c == ',') {
                record.add(field.toString());
                field.setLength(0);
                any = true;
            } else if (c == '\r' || c == '\n') {
                if (c == '\r' && i + 1 < text.length() && text.charAt(i + 1) == '\n') {
                    i++;
                }
                if (any || field.length() > 0) {
                    record.add(field.toString());
                    records.add(record);
                }
                record = new ArrayList<>();
                field.setLength(0);
                any = false;
                line++;
            } else {
                field.append(c);
                any = true;
            }
        }
        if (quoted) {
            throw new IllegalArgumentException(file + ": line " + line + ": a quoted field is not closed");
        }
        if (any || field.length() > 0) {
            record.add(field.toString());
            records.add(record);
        }
        return records;
    }
}
