package settle.datasets.table;

import java.util.List;
import java.util.Locale;
import java.util.Objects;

/**
 * How a CSV table's columns become features: a plan's {@code data.features}, {@code data.drop},
 * {@code data.categorical}, {@code data.max-levels} and {@code data.missing} (docs/datasets.md, "Tables").
 *
 * @param features the feature columns in the order wanted, or null for every column but the label, in file order
 * @param drop columns taken out of the features (an ID, a constant); may be empty
 * @param categorical numeric-coded columns to one-hot encode as categories (text columns are categorical anyway);
 *        may be empty
 * @param maxLevels the most distinct values a categorical column may have in the training split (≥ 2)
 * @param missing what to do with missing cells
 */
public record TableOptions(List<String> features, List<String> drop, List<String> categorical, int maxLevels,
        Missing missing) {

    /** The default of {@code data.max-levels}. */
    public static final int DEFAULT_MAX_LEVELS = 50;

    /** Every column but the label, text columns one-hot, at most 50 levels, missing cells refused. */
    public static final TableOptions DEFAULTS = new TableOptions(null, List.of(), List.of(), DEFAULT_MAX_LEVELS,
            Missing.REFUSE);

    /** Copies the lists and checks the level cap. */
    public TableOptions {
        features = features == null ? null : List.copyOf(features);
        drop = List.copyOf(drop);
        categorical = List.copyOf(categorical);
        Objects.requireNonNull(missing, "missing");
        if (maxLevels < 2) {
            throw new IllegalArgumentException("max-levels must be at least 2: " + maxLevels);
        }
    }

    /** @return true when every key has its default (a plan without any of them) */
    public boolean isDefault() {
        return equals(DEFAULTS);
    }

    /** {@code data.missing}: what happens to a missing cell of a feature column. */
    public enum Missing {
        /** Refuse the table, counting the missing cells per column. */
        REFUSE,
        /** Drop every row with a missing cell in a feature column, from each split. */
        DROP_ROWS,
        /** Numbers: the training split's median plus a 0/1 "was missing" column; categories: a level of its own. */
        IMPUTE;

        /** @return the plan spelling: refuse, drop-rows, impute */
        public String key() {
            return name().toLowerCase(Locale.ROOT).replace('_', '-');
        }

        /**
         * @param text refuse, drop-rows or impute
         * @return the rule
         * @throws IllegalArgumentException for anything else
         */
        public static Missing parse(String text) {
            for (Missing m : values()) {
                if (m.key().equals(text)) {
                    return m;
                }
            }
            throw new IllegalArgumentException("'" + text + "' is not accepted; expected refuse, drop-rows or impute");
        }
    }
}
