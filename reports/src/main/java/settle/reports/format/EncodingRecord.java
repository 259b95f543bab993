package settle.reports.format;

import java.util.ArrayList;
import java.util.List;

/**
 * {@code encoding.json}: how the data's columns became the model's inputs, and the test split's labels (README,
 * "Study directory"). What the runner writes through {@link EncodingJson#write} and the report reads through
 * {@link EncodingJson#read}. A CSV table records its columns as read, each feature column's encoding fitted on the
 * training split, and per split the rows kept and the cells imputed or unseen; every other source records a plain
 * encoding: one number column per feature, nothing missing, nothing imputed.
 *
 * @param source the plan's data source
 * @param table true for a CSV table read through the table path; false for a plain encoding
 * @param missing the rule for missing cells ({@code refuse}, {@code drop-rows}, {@code impute}); {@code refuse} for a
 *     plain encoding
 * @param inputs every column of the source in file order, the label among them for a table; a plain encoding lists
 *     its features
 * @param features the feature columns in input order, each with its outputs
 * @param splits training first, then holdout (when it has rows) and test
 * @param testLabels the class index of every test row, in the row order of the replicate files'
 *     {@code test_probabilities}. Not copied: treat as read-only.
 */
public record EncodingRecord(String source, boolean table, String missing, List<Input> inputs,
        List<Feature> features, List<Split> splits, int[] testLabels) {

    /** The number type of an input column. */
    public static final String NUMBER = "number";
    /** The text type of an input column. */
    public static final String TEXT = "text";
    /** A feature encoded as one-hot levels. */
    public static final String CATEGORY = "category";

    public EncodingRecord {
        inputs = List.copyOf(inputs);
        features = List.copyOf(features);
        splits = List.copyOf(splits);
    }

    /**
     * One column of the source as read.
     *
     * @param name its header name
     * @param type {@code number} or {@code text}
     * @param role {@code label}, {@code feature}, {@code dropped} (by {@code data.drop}) or {@code unlisted} (not in
     *     {@code data.features})
     * @param missing its missing cells over every row read
     */
    public record Input(String name, String type, String role, int missing) {
    }

    /**
     * One feature column's encoding, fitted on the training split.
     *
     * @param name the column's name
     * @param encoding {@code number} (passed through) or {@code category} (one-hot)
     * @param levels a category's training levels in output order (its missing level excluded); empty for a number
     * @param missingLevel a category whose missing training cells form a level of their own (its last output)
     * @param median the training median that fills a number column's gaps; NaN when none is imputed
     * @param indicator a number column followed by a 0/1 "was missing" output
     * @param outputs the names of its outputs, in input order
     */
    public record Feature(String name, String encoding, List<String> levels, boolean missingLevel, double median,
            boolean indicator, List<String> outputs) {
        public Feature {
            levels = List.copyOf(levels);
            outputs = List.copyOf(outputs);
        }
    }

    /**
     * One split after the missing-value rule.
     *
     * @param name {@code training}, {@code holdout} or {@code test}
     * @param rows the rows it kept
     * @param dropped the rows {@code data.missing: drop-rows} took out of it
     * @param classCounts its rows per class, in class order
     * @param imputed per feature (in {@code features} order), the cells filled by the training median or level
     * @param unseen per feature, the cells whose value training never saw (encoded as zeros)
     */
    public record Split(String name, int rows, int dropped, int[] classCounts, int[] imputed, int[] unseen) {
    }

    /** @return every output's name, in input order: the names of θ's weight coordinates */
    public List<String> outputs() {
        List<String> out = new ArrayList<>();
        for (Feature f : features) {
            out.addAll(f.outputs());
        }
        return out;
    }

    /** @return the split named {@code name}, or null */
    public Split split(String name) {
        for (Split s : splits) {
            if (s.name().equals(name)) {
                return s;
            }
        }
        return null;
    }
}
