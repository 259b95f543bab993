package settle.experiments.study;

import java.nio.file.Path;
import java.util.ArrayList;
import java.util.List;
import java.util.Locale;
import settle.datasets.Dataset;
import settle.datasets.table.Encoding;
import settle.datasets.table.TableReport;
import settle.experiments.plan.PlanData;
import settle.input.BadInputException;
import settle.reports.format.EncodingRecord;
import settle.reports.format.StudyFormat;

/**
 * The study's {@code encoding.json} from its prepared data ({@link EncodingRecord}), and the check a resumed run
 * makes that the encoding is the one its study recorded ({@link #refuseChanged}).
 */
public final class EncodingFile {

    private EncodingFile() {
    }

    /**
     * @param source the plan's data source
     * @param data the plan's data, split and encoded
     * @return what {@code encoding.json} records: a CSV table's columns, encoding and splits, or a plain encoding (one
     *     number column per feature) for any other source; with the test split's labels
     */
    public static EncodingRecord of(String source, PlanData data) {
        Dataset test = data.test();
        int classes = data.all().classes();
        int[] testLabels = test.labels().clone();
        int[] testCounts = new int[classes];
        for (int y : testLabels) {
            testCounts[y]++;
        }
        TableReport t = data.table();
        if (t == null) {
            return plain(source, data, testLabels, testCounts);
        }
        List<EncodingRecord.Input> inputs = new ArrayList<>();
        for (TableReport.ColumnReport c : t.columns()) {
            inputs.add(new EncodingRecord.Input(c.name(), c.numeric() ? EncodingRecord.NUMBER : EncodingRecord.TEXT,
                    c.role().name().toLowerCase(Locale.ROOT), c.missing()));
        }
        List<EncodingRecord.Feature> features = new ArrayList<>();
        for (Encoding.Feature f : t.encoding().columns()) {
            features.add(new EncodingRecord.Feature(f.name(), f.kind() == Encoding.Kind.NUMBER ? EncodingRecord.NUMBER
                    : EncodingRecord.CATEGORY, f.levels(), f.missingLevel(), f.median(), f.indicator(), f.outputs()));
        }
        List<EncodingRecord.Split> splits = new ArrayList<>();
        int width = features.size();
        TableReport.PartReport testPart = null;
        for (TableReport.PartReport p : t.parts()) {
            if (p.name().equals("test")) {
                testPart = p;
            } else {
                splits.add(new EncodingRecord.Split(p.name(), p.rows(), p.dropped(), p.classCounts(), p.imputed(),
                        p.unseen()));
            }
        }
        splits.add(new EncodingRecord.Split("test", test.rows(), testPart == null ? 0 : testPart.dropped(), testCounts,
                testPart == null ? new int[width] : testPart.imputed(),
                testPart == null ? new int[width] : testPart.unseen()));
        return new EncodingRecord(source, true, t.missing().key(), inputs, features, splits, testLabels);
    }

    private static EncodingRecord plain(String source, PlanData data, int[] testLabels, int[] testCounts) {
        List<EncodingRecord.Input> inputs = new ArrayList<>();
        List<EncodingRecord.Feature> features = new ArrayList<>();
        for (String name : data.all().featureNames()) {
            inputs.add(new EncodingRecord.Input(name, EncodingRecord.NUMBER, "feature", 0));
            features.add(new EncodingRecord.Feature(name, EncodingRecord.NUMBER, List.of(), false, Double.NaN, false,
                    List.of(name)));
        }
        int width = features.size();
        List<EncodingRecord.Split> splits = new ArrayList<>();
        splits.add(new EncodingRecord.Split("training", data.train().rows(), 0, data.train().classCounts(),
                new int[width], new int[width]));
        if (data.holdout() != null && data.holdout().rows() > 0) {
            splits.add(new EncodingRecord.Split("holdout", data.holdout().rows(), 0, data.holdout().classCounts(),
                    new int[width], new int[width]));
        }
        splits.add(new EncodingRecord.Split("test", data.test().rows(), 0, testCounts, new int[width],
                new int[width]));
        return new EncodingRecord(source, false, "refuse", inputs, features, splits, testLabels);
    }

    /**
     * Refuses to resume a study whose recorded encoding differs from the one this run's plan and data give, naming
     * the first difference and the plan key behind it; a study that recorded none (written before settle did) is not
     * checked here.
     *
     * @param directory the study directory, as messages name it
     * @param recorded the encoding the study recorded, or null
     * @param now the encoding of this run
     * @throws BadInputException keyed by the plan's data key (data.features, data.drop, data.categorical,
     *     data.missing, data.source) when they differ
     */
    public static void refuseChanged(Path directory, EncodingRecord recorded, EncodingRecord now) {
        refuseChanged(directory, recorded, now, false);
    }

    /**
     * As {@link #refuseChanged(Path, EncodingRecord, EncodingRecord)}; when the plan, the data and the split are
     * those the study was run with, the encoding they give cannot have changed, so a difference means the file was
     * edited or damaged: the refusal then names the file and the field, and says how to have it written again
     * without losing results.
     *
     * @param unchanged true when the plan's, the data's and the split's hashes are those the manifest records
     */
    public static void refuseChanged(Path directory, EncodingRecord recorded, EncodingRecord now, boolean unchanged) {
        if (recorded == null) {
            return;
        }
        String[] change = change(recorded, now);
        if (change == null) {
            return;
        }
        if (unchanged) {
            throw BadInputException.inFile(directory.resolve(StudyFormat.ENCODING).toString(), change[2],
                    "does not match the encoding of the plan and the data, which are unchanged since the study"
                    + " was run (" + change[1] + "): the file was edited or damaged; "
                    + StudyFormat.encodingRemedy(directory));
        }
        throw BadInputException.inFile(directory.toString(), change[0], change[1] + "; this study was run with"
                + " the encoding it records in " + StudyFormat.ENCODING + ": use --fresh to discard its results, or"
                + " --out DIR for a new study");
    }

    /**
     * @return null when the two encodings give the same inputs from the same columns in the same way; else the plan
     *     key behind the first difference, the difference in words, and the field of encoding.json that holds it
     */
    static String[] change(EncodingRecord was, EncodingRecord now) {
        if (was.table() != now.table()) {
            return new String[] {"data.source", "the data is now " + (now.table() ? "a csv: table" : "not a csv: table")
                    + " (was " + (was.table() ? "a csv: table" : "not a csv: table") + ")", "kind"};
        }
        if (!was.missing().equals(now.missing())) {
            return new String[] {"data.missing", "now " + now.missing() + " (was " + was.missing() + ")",
                "missing"};
        }
        for (int i = 0; i < was.inputs().size(); i++) {
            EncodingRecord.Input old = was.inputs().get(i);
            EncodingRecord.Input cur = input(now, old.name());
            String at = "inputs[" + i + "].";
            if (cur == null) {
                return new String[] {"data.source", "column " + shown(old.name()) + " is no longer in the table",
                        at + "name"};
            }
            if (!cur.role().equals(old.role())) {
                return new String[] {roleKey(old.role(), cur.role()), "column " + shown(old.name()) + " is now "
                        + role(cur.role()) + " (was " + role(old.role()) + ")", at + "role"};
            }
            if (!cur.type().equals(old.type())) {
                return new String[] {"data.source", "column " + shown(old.name()) + " now reads as " + cur.type()
                        + " (was " + old.type() + ")", at + "type"};
            }
        }
        for (EncodingRecord.Input cur : now.inputs()) {
            if (input(was, cur.name()) == null) {
                return new String[] {"data.source", "column " + shown(cur.name()) + " is new in the table ("
                        + role(cur.role()) + ")", "inputs"};
            }
        }
        int n = Math.max(was.features().size(), now.features().size());
        for (int j = 0; j < n; j++) {
            if (j >= was.features().size() || j >= now.features().size()) {
                return new String[] {"data.features", "the table gives " + now.features().size() + " feature columns"
                        + " (was " + was.features().size() + ")", "features"};
            }
            EncodingRecord.Feature old = was.features().get(j);
            EncodingRecord.Feature cur = now.features().get(j);
            String name = shown(cur.name());
            String at = "features[" + j + "].";
            if (!old.name().equals(cur.name())) {
                return new String[] {"data.features", "feature " + (j + 1) + " is now column " + name + " (was "
                        + shown(old.name()) + ")", at + "name"};
            }
            if (!old.encoding().equals(cur.encoding())) {
                return new String[] {"data.categorical", "column " + name + " is now " + (cur.encoding().equals(
                        EncodingRecord.CATEGORY) ? "categorical" : "a number") + " (was " + (old.encoding().equals(
                        EncodingRecord.CATEGORY) ? "categorical" : "a number") + ")", at + "encoding"};
            }
            if (!old.levels().equals(cur.levels())) {
                return new String[] {"data.categorical", "column " + name + " now has levels " + levels(cur.levels())
                        + " (was " + levels(old.levels()) + ")", at + "levels"};
            }
            if (old.missingLevel() != cur.missingLevel() || old.indicator() != cur.indicator()) {
                return new String[] {"data.missing", "column " + name + (cur.missingLevel() || cur.indicator()
                        ? " now has gaps in training, encoded as " : " no longer has gaps in training, which were"
                        + " encoded as ") + (cur.encoding().equals(EncodingRecord.CATEGORY) ? "a level of their own"
                        : "a 'was missing' input"), at + (cur.encoding().equals(EncodingRecord.CATEGORY)
                        ? "missing_level" : "indicator")};
            }
            if (Double.doubleToLongBits(old.median()) != Double.doubleToLongBits(cur.median())) {
                return new String[] {"data.missing", "column " + name + " now fills its gaps with the training median "
                        + cur.median() + " (was " + old.median() + ")", at + "median"};
            }
            if (!old.outputs().equals(cur.outputs())) {
                return new String[] {"data.features", "column " + name + " now gives the inputs "
                        + levels(cur.outputs()) + " (was " + levels(old.outputs()) + ")", at + "outputs"};
            }
        }
        return null;
    }

    private static EncodingRecord.Input input(EncodingRecord e, String name) {
        for (EncodingRecord.Input c : e.inputs()) {
            if (c.name().equals(name)) {
                return c;
            }
        }
        return null;
    }

    private static String roleKey(String was, String now) {
        if (was.equals("label") || now.equals("label")) {
            return "data.label";
        }
        if (was.equals("dropped") || now.equals("dropped")) {
            return "data.drop";
        }
        return "data.features";
    }

    private static String role(String role) {
        return switch (role) {
            case "label" -> "the label";
            case "feature" -> "a feature";
            case "dropped" -> "dropped";
            default -> "not a feature";
        };
    }

    private static String shown(String name) {
        return BadInputException.shown(name);
    }

    /** @return the levels as a list, at most 8 shown then "… (n in all)" */
    private static String levels(List<String> levels) {
        StringBuilder b = new StringBuilder();
        int shown = Math.min(levels.size(), 8);
        for (int i = 0; i < shown; i++) {
            b.append(i == 0 ? "" : ", ").append(BadInputException.shown(levels.get(i)));
        }
        if (levels.size() > shown) {
            b.append(", … (").append(levels.size()).append(" in all)");
        }
        return levels.isEmpty() ? "none" : b.toString();
    }
}
