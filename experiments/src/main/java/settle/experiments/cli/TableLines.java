package settle.experiments.cli;

import java.util.ArrayList;
import java.util.List;
import java.util.Locale;
import settle.datasets.table.Encoding;
import settle.datasets.table.TableReport;

/**
 * The resolved table as {@code settle check} prints it: each column of the CSV file with its type, its missing
 * cells and what became of it (inputs, levels, imputation, dropped, label), the number of inputs after encoding, the
 * classes with their counts per split, and what each split kept, imputed or could not encode.
 */
final class TableLines {

    private TableLines() {
    }

    /** @return the lines, without indentation of the block itself */
    static List<String> of(TableReport t) {
        List<String> out = new ArrayList<>();
        out.add("table: " + t.rows() + " rows, " + t.columns().size() + " columns; data.missing: " + t.missing().key());
        int nameWidth = "column".length();
        for (TableReport.ColumnReport c : t.columns()) {
            nameWidth = Math.max(nameWidth, Math.min(c.name().length(), 40));
        }
        String format = "  %-" + nameWidth + "s  %-6s  %7s  %s";
        out.add(String.format(Locale.ROOT, format, "column", "type", "missing", "encoding"));
        for (TableReport.ColumnReport c : t.columns()) {
            String name = c.name().length() > 40 ? c.name().substring(0, 39) + "…" : c.name();
            out.add(String.format(Locale.ROOT, format, name, c.numeric() ? "number" : "text", c.missing(),
                    encoding(c)));
        }
        out.add("  inputs after encoding: " + t.encoding().width());
        StringBuilder classes = new StringBuilder("  classes:");
        for (int k = 0; k < t.classNames().size(); k++) {
            int total = 0;
            StringBuilder per = new StringBuilder();
            for (TableReport.PartReport p : t.parts()) {
                total += p.classCounts()[k];
                per.append(per.length() == 0 ? "" : ", ").append(p.name()).append(' ').append(p.classCounts()[k]);
            }
            classes.append(k == 0 ? " " : "; ").append(t.classNames().get(k)).append(' ').append(total);
            if (t.parts().size() > 1) {
                classes.append(" (").append(per).append(')');
            }
        }
        out.add(classes.toString());
        for (TableReport.PartReport p : t.parts()) {
            StringBuilder b = new StringBuilder("  " + p.name() + " split: " + p.rows() + " rows");
            if (p.dropped() > 0) {
                b.append("; ").append(p.dropped()).append(" dropped for gaps");
            }
            int imputed = sum(p.imputed());
            if (imputed > 0) {
                b.append("; ").append(imputed).append(imputed == 1 ? " cell" : " cells").append(" imputed");
            }
            int unseen = sum(p.unseen());
            if (unseen > 0) {
                b.append("; ").append(unseen).append(unseen == 1 ? " cell" : " cells")
                        .append(" unseen in training, encoded as zeros");
            }
            out.add(b.toString());
        }
        return out;
    }

    private static String encoding(TableReport.ColumnReport c) {
        return switch (c.role()) {
            case LABEL -> "label";
            case DROPPED -> "dropped (data.drop)";
            case UNLISTED -> "not a feature (data.features leaves it out)";
            case FEATURE -> feature(c.feature());
        };
    }

    private static String feature(Encoding.Feature f) {
        if (f.kind() == Encoding.Kind.NUMBER) {
            if (f.indicator()) {
                return "2 inputs: the value (training median " + number(f.median()) + " where missing) and '"
                        + f.outputs().get(1) + "' (0/1)";
            }
            return Double.isNaN(f.median()) ? "1 input" : "1 input (training median " + number(f.median())
                    + " where missing)";
        }
        int k = f.levels().size();
        String levels = k + (k == 1 ? " level" : " levels") + (f.text() ? "" : " (data.categorical)");
        return f.missingLevel() ? levels + " + a level for gaps → " + f.width() + " inputs"
                : levels + " → " + f.width() + (f.width() == 1 ? " input" : " inputs");
    }

    private static String number(double v) {
        return v == Math.rint(v) && Math.abs(v) < 1e15 ? Long.toString((long) v) : Double.toString(v);
    }

    private static int sum(int[] values) {
        int s = 0;
        for (int v : values) {
            s += v;
        }
        return s;
    }
}
