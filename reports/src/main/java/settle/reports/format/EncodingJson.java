package settle.reports.format;

import java.util.ArrayList;
import java.util.List;
import settle.input.BadInputException;
import settle.reports.format.JsonIn.Obj;
import settle.reports.format.JsonIn.Range;

/**
 * {@code encoding.json}: its one writer and its one reader (README, "Study directory"). Reading checks every field
 * and that the file agrees with the manifest: the outputs, feature by feature, are the manifest's feature names; the
 * class counts have one entry per class; the test labels are the manifest's test rows, each a class index.
 */
public final class EncodingJson {

    private static final List<String> ROLES = List.of("label", "feature", "dropped", "unlisted");
    private static final List<String> SPLITS = List.of("training", "holdout", "test");

    private EncodingJson() {
    }

    /** @return the file's bytes */
    public static byte[] write(EncodingRecord e) {
        return JsonOut.document(g -> {
            g.writeStartObject();
            g.writeNumberField("format", StudyFormat.VERSION);
            g.writeStringField("source", e.source());
            g.writeStringField("kind", e.table() ? "table" : "plain");
            g.writeStringField("missing", e.missing());
            g.writeArrayFieldStart("inputs");
            for (EncodingRecord.Input c : e.inputs()) {
                g.writeStartObject();
                g.writeStringField("name", c.name());
                g.writeStringField("type", c.type());
                g.writeStringField("role", c.role());
                g.writeNumberField("missing", c.missing());
                g.writeEndObject();
            }
            g.writeEndArray();
            g.writeArrayFieldStart("features");
            for (EncodingRecord.Feature f : e.features()) {
                g.writeStartObject();
                g.writeStringField("name", f.name());
                g.writeStringField("encoding", f.encoding());
                JsonOut.strings(g, "levels", f.levels());
                g.writeBooleanField("missing_level", f.missingLevel());
                JsonOut.number(g, "median", f.median());
                g.writeBooleanField("indicator", f.indicator());
                JsonOut.strings(g, "outputs", f.outputs());
                g.writeEndObject();
            }
            g.writeEndArray();
            g.writeArrayFieldStart("splits");
            for (EncodingRecord.Split s : e.splits()) {
                g.writeStartObject();
                g.writeStringField("name", s.name());
                g.writeNumberField("rows", s.rows());
                g.writeNumberField("dropped", s.dropped());
                JsonOut.array(g, "class_counts", wholes(s.classCounts()));
                JsonOut.array(g, "imputed", wholes(s.imputed()));
                JsonOut.array(g, "unseen", wholes(s.unseen()));
                g.writeEndObject();
            }
            g.writeEndArray();
            JsonOut.array(g, "test_labels", wholes(e.testLabels()));
            g.writeEndObject();
        });
    }

    private static long[] wholes(int[] values) {
        long[] out = new long[values.length];
        for (int i = 0; i < values.length; i++) {
            out[i] = values[i];
        }
        return out;
    }

    private static int[] ints(long[] values) {
        int[] out = new int[values.length];
        for (int i = 0; i < values.length; i++) {
            out[i] = (int) values[i];
        }
        return out;
    }

    /**
     * Reads and checks {@code encoding.json}.
     *
     * @param bytes the file's content
     * @param file the file as messages name it
     * @param manifest the study's manifest, which the file must agree with
     * @return the encoding
     * @throws BadInputException naming the file and the field
     */
    public static EncodingRecord read(byte[] bytes, String file, Manifest manifest) {
        return read(bytes, file, manifest.featureNames(), manifest.classes(), manifest.testRows());
    }

    /**
     * Reads and checks {@code encoding.json} on its own, as a resumed run does before it compares the recorded
     * encoding with its own: every field and the file's own agreement (outputs per feature, class counts per split,
     * test labels against the test split), not the manifest's.
     *
     * @param bytes the file's content
     * @param file the file as messages name it
     * @return the encoding
     * @throws BadInputException naming the file and the field
     */
    public static EncodingRecord read(byte[] bytes, String file) {
        return read(bytes, file, null, -1, -1);
    }

    private static EncodingRecord read(byte[] bytes, String file, List<String> expectedNames, int classCount,
            int testRows) {
        Obj r = JsonIn.read(bytes, file);
        int format = r.integer("format", Integer.MIN_VALUE, Integer.MAX_VALUE);
        if (format != StudyFormat.VERSION) {
            throw r.problem("format", "this file is in format " + format + "; this settle reads format "
                    + StudyFormat.VERSION);
        }
        String source = r.text("source");
        boolean table = r.choice("kind", "table", "plain").equals("table");
        String missing = r.choice("missing", "refuse", "drop-rows", "impute");
        List<EncodingRecord.Input> inputs = new ArrayList<>();
        for (Obj c : r.objects("inputs")) {
            inputs.add(new EncodingRecord.Input(c.text("name"), c.choice("type", EncodingRecord.NUMBER,
                    EncodingRecord.TEXT), c.choice("role", ROLES.toArray(String[]::new)),
                    c.integer("missing", 0, Integer.MAX_VALUE)));
        }
        List<EncodingRecord.Feature> features = new ArrayList<>();
        List<String> outputs = new ArrayList<>();
        for (Obj f : r.objects("features")) {
            String encoding = f.choice("encoding", EncodingRecord.NUMBER, EncodingRecord.CATEGORY);
            List<String> levels = f.texts("levels");
            boolean missingLevel = f.bool("missing_level");
            double median = f.numberOrNull("median", Range.ANY);
            boolean indicator = f.bool("indicator");
            List<String> out = f.texts("outputs");
            int width = encoding.equals(EncodingRecord.NUMBER) ? (indicator ? 2 : 1)
                    : levels.size() + (missingLevel ? 1 : 0);
            if (out.size() != width) {
                throw f.problem("outputs", "lists " + out.size() + " outputs; its encoding gives " + width);
            }
            for (int j = 0; expectedNames != null && j < out.size(); j++) {
                int at = outputs.size() + j;
                if (at >= expectedNames.size() || !out.get(j).equals(expectedNames.get(at))) {
                    throw f.problem("outputs", "output " + BadInputException.shown(out.get(j)) + " is not feature "
                            + (at + 1) + " of the manifest ("
                            + (at < expectedNames.size() ? BadInputException.shown(expectedNames.get(at)) : "none")
                            + "); the outputs in order are the manifest's feature names");
                }
            }
            outputs.addAll(out);
            features.add(new EncodingRecord.Feature(f.text("name"), encoding, levels, missingLevel, median, indicator,
                    out));
        }
        if (expectedNames != null && outputs.size() != expectedNames.size()) {
            throw r.problem("features", "give " + outputs.size() + " outputs; the manifest lists "
                    + expectedNames.size() + " features");
        }
        List<EncodingRecord.Split> splits = new ArrayList<>();
        List<Obj> list = r.objects("splits");
        int classes = classCount;
        if (classes < 0 && !list.isEmpty()) {
            classes = Math.max(2, list.get(0).wholes("class_counts", -1, 0, Integer.MAX_VALUE).length);
        }
        int last = -1;
        for (Obj s : list) {
            String name = s.choice("name", SPLITS.toArray(String[]::new));
            int order = SPLITS.indexOf(name);
            if (order <= last) {
                throw s.problem("name", "is out of order or repeated; the splits are listed training, holdout, test");
            }
            last = order;
            int rows = s.integer("rows", 0, Integer.MAX_VALUE);
            int[] counts = ints(s.wholes("class_counts", classes, 0, Integer.MAX_VALUE));
            long sum = 0;
            for (int c : counts) {
                sum += c;
            }
            if (sum != rows) {
                throw s.problem("class_counts", "add up to " + sum + "; the split has " + rows + " rows");
            }
            splits.add(new EncodingRecord.Split(name, rows, s.integer("dropped", 0, Integer.MAX_VALUE), counts,
                    ints(s.wholes("imputed", features.size(), 0, Integer.MAX_VALUE)),
                    ints(s.wholes("unseen", features.size(), 0, Integer.MAX_VALUE))));
        }
        if (splits.isEmpty() || !splits.get(0).name().equals("training")
                || !splits.get(splits.size() - 1).name().equals("test")) {
            throw r.problem("splits", "must list training first and test last");
        }
        EncodingRecord.Split test = splits.get(splits.size() - 1);
        if (testRows >= 0 && test.rows() != testRows) {
            throw r.problem("splits", "give the test split " + test.rows() + " rows; the manifest says " + testRows);
        }
        int[] labels = ints(r.wholes("test_labels", test.rows(), 0, classes - 1));
        int[] counted = new int[classes];
        for (int y : labels) {
            counted[y]++;
        }
        if (!java.util.Arrays.equals(counted, test.classCounts())) {
            throw r.problem("test_labels", "count " + java.util.Arrays.toString(counted) + " rows per class; the test"
                    + " split's class_counts are " + java.util.Arrays.toString(test.classCounts()));
        }
        return new EncodingRecord(source, table, missing, inputs, features, splits, labels);
    }
}
