package settle.datasets;

/**
 * The two parts of a stratified split. Row indices refer to the rows of the dataset that was split, ascending;
 * the parts hold those rows in that order.
 *
 * @param train the larger part (the training split, or what remains of it after a holdout is carved)
 * @param test the part of the requested fraction (the test split, or the holdout)
 * @param trainRows the rows of {@code train}, ascending; treat as read-only
 * @param testRows the rows of {@code test}, ascending; treat as read-only
 */
public record Split(Dataset train, Dataset test, int[] trainRows, int[] testRows) {

    /** Checks that the parts and their row lists agree. */
    public Split {
        if (train.rows() != trainRows.length || test.rows() != testRows.length) {
            throw new IllegalArgumentException("split parts and row lists disagree");
        }
    }
}
