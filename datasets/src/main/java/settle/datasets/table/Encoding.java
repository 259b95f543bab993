package settle.datasets.table;

import java.util.ArrayList;
import java.util.List;

/**
 * How each feature column of a table becomes model inputs, fitted on the training split only and applied
 * unchanged to every row: a number column gives one input (and, when imputed with training gaps, a 0/1 "was
 * missing" input after it); a categorical column gives one 0/1 input per level seen in training, in sorted order
 * (text by character code, numeric codes numerically), then one for its missing cells when they are a level of
 * their own. A value not seen in training gives zeros in every input of its column.
 *
 * @param columns the feature columns in input order
 */
public record Encoding(List<Feature> columns) {

    /** Copies the list. */
    public Encoding {
        columns = List.copyOf(columns);
    }

    /** How one input column is encoded. */
    public enum Kind {
        /** a number column, passed through (missing cells imputed or refused) */
        NUMBER,
        /** a categorical column, one-hot over its training levels */
        CATEGORY
    }

    /**
     * One feature column's encoding.
     *
     * @param name the column's header name
     * @param kind number or category
     * @param text true when the column was read as text (a category by its cells, not by {@code data.categorical})
     * @param levels a category's training levels in input order (its missing level excluded); empty for numbers
     * @param missingLevel a category whose missing cells in training form a level of their own (the last input)
     * @param median a number column's training median, the value of its imputed cells; NaN when none is imputed
     * @param indicator a number column that gets a 0/1 "was missing" input (it had gaps in training)
     */
    public record Feature(String name, Kind kind, boolean text, List<String> levels, boolean missingLevel,
            double median, boolean indicator) {

        /** Copies the levels. */
        public Feature {
            levels = List.copyOf(levels);
        }

        /** @return the names of this column's inputs, in order */
        public List<String> outputs() {
            List<String> out = new ArrayList<>();
            if (kind == Kind.NUMBER) {
                out.add(name);
                if (indicator) {
                    out.add(name + " (was missing)");
                }
            } else {
                for (String level : levels) {
                    out.add(name + "=" + level);
                }
                if (missingLevel) {
                    out.add(name + "=(missing)");
                }
            }
            return out;
        }

        /** @return the number of inputs this column gives */
        public int width() {
            return kind == Kind.NUMBER ? (indicator ? 2 : 1) : levels.size() + (missingLevel ? 1 : 0);
        }
    }

    /** @return every input's name, in input order */
    public List<String> outputs() {
        List<String> out = new ArrayList<>();
        for (Feature f : columns) {
            out.addAll(f.outputs());
        }
        return out;
    }

    /** @return the number of inputs */
    public int width() {
        int w = 0;
        for (Feature f : columns) {
            w += f.width();
        }
        return w;
    }
}
