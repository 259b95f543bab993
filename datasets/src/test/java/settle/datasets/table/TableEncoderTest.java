package settle.datasets.table;

import static org.junit.jupiter.api.Assertions.assertArrayEquals;
import static org.junit.jupiter.api.Assertions.assertEquals;
import static org.junit.jupiter.api.Assertions.assertThrows;
import static org.junit.jupiter.api.Assertions.assertTrue;

import java.util.List;
import org.junit.jupiter.api.Test;
import settle.input.BadInputException;
import settle.datasets.Dataset;
import settle.datasets.PreparedData;

/**
 * Every encoding and missing-value rule on small hand-made tables, with the expected matrix written out by hand
 * (row by row, inputs in the order the encoding gives them). The label is the last column unless said otherwise;
 * rows are numbered from 0 in file order.
 */
class TableEncoderTest {

    private static final int[] NONE = new int[0];

    static TableOptions options(List<String> features, List<String> drop, List<String> categorical, int maxLevels,
            TableOptions.Missing missing) {
        return new TableOptions(features, drop, categorical, maxLevels, missing);
    }

    static TableOptions missing(TableOptions.Missing rule) {
        return options(null, List.of(), List.of(), 50, rule);
    }

    static PreparedData prepare(String text, TableOptions o, int[] train, int[] holdout, int[] test) {
        return TableEncoder.prepare(TableReader.read(text, "t.csv", null, ','), o, train, holdout, test);
    }

    /** Every row trains. */
    static PreparedData prepare(String text, TableOptions o) {
        SourceTable t = TableReader.read(text, "t.csv", null, ',');
        int[] all = new int[t.rows()];
        for (int r = 0; r < all.length; r++) {
            all[r] = r;
        }
        return TableEncoder.prepare(t, o, all, NONE, NONE);
    }

    static BadInputException refused(String text, TableOptions o) {
        return assertThrows(BadInputException.class, () -> prepare(text, o));
    }

    @Test
    void textColumnsAreOneHotOverSortedLevelsBesideNumbers() {
        PreparedData p = prepare("colour,size,y\nred,1.5,a\nblue,2,b\nred,3,a\ngreen,4,b\n", TableOptions.DEFAULTS);
        Dataset d = p.all();
        assertEquals(List.of("colour=blue", "colour=green", "colour=red", "size"), d.featureNames());
        assertArrayEquals(new double[] {
            0, 0, 1, 1.5,   // red
            1, 0, 0, 2,     // blue
            0, 0, 1, 3,     // red
            0, 1, 0, 4,     // green
        }, d.featureMatrix());
        assertArrayEquals(new int[] {0, 1, 0, 1}, d.labels());
        assertEquals(List.of("a", "b"), d.classNames());
    }

    @Test
    void quotedNumbersAreNumbersAndListedCodesAreCategoriesInNumericOrder() {
        String text = "code,flag,y\n10,\"1\",p\n9,\"0\",q\n1,\"1\",p\n9,\"0\",q\n";
        Dataset plain = prepare(text, TableOptions.DEFAULTS).all();
        assertEquals(List.of("code", "flag"), plain.featureNames());
        assertArrayEquals(new double[] {10, 1, 9, 0, 1, 1, 9, 0}, plain.featureMatrix());
        Dataset coded = prepare(text, options(null, List.of(), List.of("code"), 50, TableOptions.Missing.REFUSE)).all();
        // levels 1 < 9 < 10 numerically (lexically "10" would come before "9")
        assertEquals(List.of("code=1", "code=9", "code=10", "flag"), coded.featureNames());
        assertArrayEquals(new double[] {
            0, 0, 1, 1,     // 10, "1"
            0, 1, 0, 0,     // 9, "0"
            1, 0, 0, 1,     // 1, "1"
            0, 1, 0, 0,     // 9, "0"
        }, coded.featureMatrix());
    }

    @Test
    void featuresChooseAndOrderColumnsAndDropTakesThemOut() {
        String text = "id,a,b,c,y\n1,10,20,30,p\n2,11,21,31,q\n";
        Dataset listed = prepare(text, options(List.of("c", "a"), List.of(), List.of(), 50,
                TableOptions.Missing.REFUSE)).all();
        assertEquals(List.of("c", "a"), listed.featureNames());
        assertArrayEquals(new double[] {30, 10, 31, 11}, listed.featureMatrix());
        Dataset dropped = prepare(text, options(null, List.of("id", "b"), List.of(), 50,
                TableOptions.Missing.REFUSE)).all();
        assertEquals(List.of("a", "c"), dropped.featureNames());
        assertArrayEquals(new double[] {10, 30, 11, 31}, dropped.featureMatrix());
        Dataset both = prepare(text, options(List.of("c", "a", "b"), List.of("b"), List.of(), 50,
                TableOptions.Missing.REFUSE)).all();
        assertEquals(List.of("c", "a"), both.featureNames());
    }

    @Test
    void aLevelUnseenInTrainingIsZerosAndCounted() {
        PreparedData p = prepare("colour,y\nred,p\nblue,q\ngreen,p\nred,q\n", TableOptions.DEFAULTS,
                new int[] {0, 1}, NONE, new int[] {2, 3});
        assertEquals(List.of("colour=blue", "colour=red"), p.all().featureNames());
        assertArrayEquals(new double[] {
            0, 1,   // red (training)
            1, 0,   // blue (training)
            0, 0,   // green (test): unseen
            0, 1,   // red (test)
        }, p.all().featureMatrix());
        assertArrayEquals(new int[] {0, 1}, p.train());
        assertArrayEquals(new int[] {2, 3}, p.test());
        assertArrayEquals(new int[] {1}, p.table().parts().get(1).unseen());
        assertEquals(List.of("t.csv: test split: 1 cell of 'colour' holds a value (or gap) the training split does"
                + " not have; encoded as zeros"), p.warnings());
    }

    @Test
    void refuseCountsTheMissingCellsPerColumnAndNamesTheOtherRules() {
        BadInputException e = refused("a,b,c,y\n1,,x,p\nNA,2,,q\n3,4,z,p\n5,6,w,q\n", TableOptions.DEFAULTS);
        assertEquals("t.csv: missing cells (empty, NA, N/A, NaN, null, none or ?) in 2 of 4 rows: 'a' 1 (first on"
                + " line 3), 'b' 1 (first on line 2), 'c' 1 (first on line 3); expected none under data.missing:"
                + " refuse (the default), or data.missing: drop-rows (drops those rows from each split) or impute"
                + " (training medians plus a was-missing column for numbers, a level of its own for categories)",
                e.getMessage());
        assertEquals("data.missing", e.key());
        // a gap in a column that is not a feature does not count
        Dataset d = prepare("a,b,y\n1,,p\n2,,q\n", options(null, List.of("b"), List.of(), 50,
                TableOptions.Missing.REFUSE)).all();
        assertArrayEquals(new double[] {1, 2}, d.featureMatrix());
    }

    @Test
    void dropRowsDropsFromEachSplitAndSaysHowMany() {
        String text = "a,c,y\n1,x,p\n,y,q\n3,,p\n4,z,q\n5,x,p\nNA,x,q\n6,y,p\n";
        // rows: 0 train, 1 train (gap), 2 test (gap), 3 train, 4 holdout, 5 holdout (gap), 6 test
        PreparedData p = prepare(text, missing(TableOptions.Missing.DROP_ROWS), new int[] {0, 1, 3},
                new int[] {4, 5}, new int[] {2, 6});
        Dataset d = p.all();
        // levels from the kept training rows 0 and 3 only: x, z ('y' of row 1 went with its row)
        assertEquals(List.of("a", "c=x", "c=z"), d.featureNames());
        assertArrayEquals(new double[] {
            1, 1, 0,   // row 0
            4, 0, 1,   // row 3
            5, 1, 0,   // row 4 (holdout)
            6, 0, 0,   // row 6 (test): 'y' unseen in training
        }, d.featureMatrix());
        assertArrayEquals(new int[] {0, 1}, p.train());
        assertArrayEquals(new int[] {2}, p.holdout());
        assertArrayEquals(new int[] {3}, p.test());
        assertEquals("t.csv: data.missing: drop-rows dropped 1 of 3 training, 1 of 2 holdout, 1 of 2 test rows",
                p.warnings().get(0));
        List<TableReport.PartReport> parts = p.table().parts();
        assertEquals(List.of(2, 1, 1), parts.stream().map(TableReport.PartReport::rows).toList());
        assertEquals(List.of(1, 1, 1), parts.stream().map(TableReport.PartReport::dropped).toList());
    }

    @Test
    void dropRowsThatLeavesAClassOrASplitEmptyIsRefused() {
        BadInputException e = assertThrows(BadInputException.class, () -> prepare("a,y\n1,p\n,q\n2,p\n3,q\n",
                missing(TableOptions.Missing.DROP_ROWS), new int[] {0, 1, 2}, NONE, new int[] {3}));
        assertEquals("t.csv: data.missing: drop-rows dropped 1 training rows and left class 'q' without any; expected"
                + " every class in training (data.missing: impute, or data.drop the columns with the most gaps)",
                e.getMessage());
        e = assertThrows(BadInputException.class, () -> prepare("a,y\n1,p\n2,q\n,p\n",
                missing(TableOptions.Missing.DROP_ROWS), new int[] {0, 1}, NONE, new int[] {2}));
        assertEquals("t.csv: data.missing: drop-rows dropped all 1 test rows; expected some left (data.missing:"
                + " impute, or data.drop the columns with the most gaps)", e.getMessage());
    }

    @Test
    void imputeGivesNumbersTheTrainingMedianAndAWasMissingColumnOnlyForTrainingGaps() {
        String text = "a,b,y\n1,5,p\n,6,q\n3,,p\n8,7,q\n,8,p\n";
        // rows 0, 1, 3 train; 2, 4 test. a: training values 1, 8 -> median (1 + 8)/2 = 4.5, a training gap
        // (row 1) -> a (was missing). b: training values 5, 6, 7 -> median 6, no training gap -> no indicator;
        // test row 2's gap still gets 6
        PreparedData p = prepare(text, missing(TableOptions.Missing.IMPUTE), new int[] {0, 1, 3}, NONE,
                new int[] {2, 4});
        assertEquals(List.of("a", "a (was missing)", "b"), p.all().featureNames());
        assertArrayEquals(new double[] {
            1, 0, 5,     // row 0
            4.5, 1, 6,   // row 1: a imputed
            3, 0, 6,     // row 2 (test): b imputed, no indicator for b
            8, 0, 7,     // row 3
            4.5, 1, 8,   // row 4 (test): a imputed with the training median, not the test's own
        }, p.all().featureMatrix());
        assertArrayEquals(new int[] {1, 0}, p.table().parts().get(0).imputed());
        assertArrayEquals(new int[] {1, 1}, p.table().parts().get(1).imputed());
        assertEquals(4.5, p.table().encoding().columns().get(0).median());
        // an odd count: the middle value
        assertEquals(5.0, TableEncoder.median(tech.tablesaw.api.DoubleColumn.create("v", 9, Double.NaN, 5, 1),
                new int[] {0, 1, 2, 3}));
    }

    @Test
    void imputeGivesCategoriesALevelOfTheirOwnOnlyForTrainingGaps() {
        String text = "c,d,y\nx,u,p\n,u,q\ny,v,p\nx,,q\n,w,p\n";
        // rows 0-2 train, 3-4 test. c has a training gap -> c=(missing); d has none -> a test gap is unseen
        PreparedData p = prepare(text, missing(TableOptions.Missing.IMPUTE), new int[] {0, 1, 2}, NONE,
                new int[] {3, 4});
        assertEquals(List.of("c=x", "c=y", "c=(missing)", "d=u", "d=v"), p.all().featureNames());
        assertArrayEquals(new double[] {
            1, 0, 0, 1, 0,   // x, u
            0, 0, 1, 1, 0,   // gap, u
            0, 1, 0, 0, 1,   // y, v
            1, 0, 0, 0, 0,   // x, gap (test): d has no missing level
            0, 0, 1, 0, 0,   // gap, w (test): 'w' unseen
        }, p.all().featureMatrix());
        assertArrayEquals(new int[] {0, 2}, p.table().parts().get(1).unseen());
        assertArrayEquals(new int[] {1, 0}, p.table().parts().get(1).imputed());
    }

    @Test
    void nothingAboutTestRowsReachesTheEncoding() {
        // the same training rows with two different test rows: same encoding, same training matrix
        String a = "n,c,y\n1,x,p\n,y,q\n3,x,p\n4,y,q\n100,z,p\n,,q\n";
        String b = "n,c,y\n1,x,p\n,y,q\n3,x,p\n4,y,q\n-7,w,p\n9,v,q\n";
        int[] train = {0, 1, 2, 3};
        int[] test = {4, 5};
        for (TableOptions.Missing rule : List.of(TableOptions.Missing.IMPUTE, TableOptions.Missing.DROP_ROWS)) {
            PreparedData pa = prepare(a, missing(rule), train, NONE, test);
            PreparedData pb = prepare(b, missing(rule), train, NONE, test);
            assertEquals(pa.table().encoding(), pb.table().encoding(), rule.key());
            double[] xa = pa.all().featureMatrix();
            double[] xb = pb.all().featureMatrix();
            int trainValues = pa.train().length * pa.all().features();
            assertArrayEquals(java.util.Arrays.copyOf(xa, trainValues), java.util.Arrays.copyOf(xb, trainValues));
        }
    }

    @Test
    void tooManyLevelsIsRefusedNamingTheColumn() {
        BadInputException e = refused("id,y\na,p\nb,q\nc,p\nd,q\n", options(null, List.of(), List.of(), 3,
                TableOptions.Missing.REFUSE));
        assertEquals("t.csv: categorical column 'id' has 4 distinct values in the training split, more than"
                + " data.max-levels (3): likely an ID or free text; expected it in data.drop, or a larger"
                + " data.max-levels", e.getMessage());
        assertEquals("data.max-levels", e.key());
        e = refused("v,y\n1,p\n2,q\n3,p\nx,q\n", options(null, List.of(), List.of(), 3, TableOptions.Missing.REFUSE));
        assertEquals("t.csv: categorical column 'v' has 4 distinct values in the training split, more than"
                + " data.max-levels (3): likely an ID or free text (it is text because of 'x' on line 5; 3 of its"
                + " cells are numbers); expected it in data.drop, or a larger data.max-levels", e.getMessage());
    }

    @Test
    void aColumnOfTextAmongNumbersIsCategoricalAndSaysWhy() {
        // the former malformed-corpus file non_numeric.csv: 'abc' among numbers makes b a text column
        PreparedData p = prepare("a,b,y\n1,2,p\n3,abc,q\n", TableOptions.DEFAULTS);
        assertEquals(List.of("a", "b=2", "b=abc"), p.all().featureNames());
        assertArrayEquals(new double[] {1, 1, 0, 3, 0, 1}, p.all().featureMatrix());
        PreparedData mostly = prepare("a,y\n1,p\n2,q\n3,p\nn/a?,q\n", TableOptions.DEFAULTS);
        assertEquals(List.of("t.csv: column 'a' is read as text (categories) because of 'n/a?' on line 5, although 3"
                + " of its 4 cells are numbers; fix those cells, or list it in data.categorical to keep it categorical"),
                mostly.warnings());
        assertEquals(List.of(), prepare("a,y\n1,p\n2,q\n3,p\nn/a?,q\n", options(null, List.of(), List.of("a"), 50,
                TableOptions.Missing.REFUSE)).warnings());
    }

    @Test
    void numbersInAnotherNotationAreRefusedUnlessListedAsCategories() {
        String text = "a,y\n1,p\n\"1,5\",q\n2,p\n";
        BadInputException e = refused(text, TableOptions.DEFAULTS);
        assertEquals("t.csv: line 3, column 1 ('a'): expected a number, found '1,5'; settle reads numbers with a"
                + " decimal point and without thousands separators, '%' or suffixes: convert the column, or list it in"
                + " data.categorical if it holds categories", e.getMessage());
        assertEquals("data.categorical", e.key());
        Dataset d = prepare(text, options(null, List.of(), List.of("a"), 50, TableOptions.Missing.REFUSE)).all();
        assertEquals(List.of("a=1", "a=1,5", "a=2"), d.featureNames());
    }

    @Test
    void aColumnWithADifferentWholeNumberInEveryRowIsWarnedAbout() {
        StringBuilder b = new StringBuilder("id,x,code,y\n");
        for (int r = 0; r < 25; r++) {
            b.append(1000 + r).append(',').append(0.5 + r).append(",c").append(r).append(',').append(r % 2).append('\n');
        }
        PreparedData p = prepare(b.toString(), TableOptions.DEFAULTS);
        // x (measurements with a fraction) is not warned about; the text codes c0 … c24 are
        assertEquals(List.of("t.csv: column 'id' has a different value in every row (an ID?); if it is one, list it"
                + " in data.drop", "t.csv: column 'code' has a different value in every row (an ID?); if it is one,"
                + " list it in data.drop"), p.warnings());
    }

    @Test
    void keysNamingNoUsableColumnAreRefusedWithTheirKey() {
        String text = "a,b,y\n1,2,p\n3,4,q\n";
        Object[][] cases = {
            {options(List.of("a", "z"), List.of(), List.of(), 50, TableOptions.Missing.REFUSE), "features",
                "t.csv: data.features names 'z', which is not a column; expected one of: a, b, y"},
            {options(List.of("a", "y"), List.of(), List.of(), 50, TableOptions.Missing.REFUSE), "features",
                "t.csv: data.features names the label column 'y'; expected feature columns only"},
            {options(List.of("a", "a"), List.of(), List.of(), 50, TableOptions.Missing.REFUSE), "features",
                "t.csv: data.features names 'a' twice; expected each column once"},
            {options(null, List.of("y"), List.of(), 50, TableOptions.Missing.REFUSE), "drop",
                "t.csv: data.drop names the label column 'y'; expected feature columns only"},
            {options(List.of("a"), List.of("b"), List.of(), 50, TableOptions.Missing.REFUSE), "drop",
                "t.csv: data.drop names 'b', which data.features does not list; expected a feature"},
            {options(null, List.of("a", "b"), List.of(), 50, TableOptions.Missing.REFUSE), "drop",
                "t.csv: no feature column is left; expected at least one"},
            {options(null, List.of("b"), List.of("b"), 50, TableOptions.Missing.REFUSE), "categorical",
                "t.csv: data.categorical names 'b', which is not a feature (data.drop takes it out); expected feature"
                    + " columns only"},
        };
        for (Object[] c : cases) {
            BadInputException e = refused(text, (TableOptions) c[0]);
            assertEquals(c[2], e.getMessage());
            assertEquals("data." + c[1], e.key());
        }
    }

    @Test
    void aNumericLabelWithTooManyValuesLooksLikeARegressionTarget() {
        // cap max(20, 5 % of 40 rows = 2) = 20 distinct numbers: 20 pass, 21 are refused
        StringBuilder ok = new StringBuilder("a,y\n");
        StringBuilder bad = new StringBuilder("a,y\n");
        for (int r = 0; r < 40; r++) {
            ok.append(r).append(',').append(r % 20).append('\n');
            bad.append(r).append(',').append(r % 21 + 0.5).append('\n');
        }
        assertEquals(20, TableReader.read(ok.toString(), "t.csv", null, ',').classNames().size());
        BadInputException e = assertThrows(BadInputException.class, () -> TableReader.read(bad.toString(), "t.csv", null, ','));
        assertEquals("t.csv: label column 'y' holds 21 distinct numbers in 40 rows, more than max(20, 5 % of the rows)"
                + " = 20: looks like a regression target; settle trains classifiers; expected class labels",
                e.getMessage());
        assertEquals("data.label", e.key());
        // 1 000 rows: the cap is 5 % = 50 numbers; text labels are never capped
        StringBuilder many = new StringBuilder("a,y\n");
        for (int r = 0; r < 1000; r++) {
            many.append(r).append(',').append(r % 50).append('\n');
        }
        assertEquals(50, TableReader.read(many.toString(), "t.csv", null, ',').classNames().size());
        assertTrue(TableReader.read("a,y\n1,k1\n2,k2\n3,k3\n4,k4\n5,k5\n6,k6\n7,k7\n8,k8\n9,k9\n10,k10\n11,k11\n12,k12\n"
                + "13,k13\n14,k14\n15,k15\n16,k16\n17,k17\n18,k18\n19,k19\n20,k20\n21,k21\n", "t.csv", null, ',')
                .classNames().size() == 21);
    }

    @Test
    void missingSpellingsAreGapsInTextColumnsToo() {
        PreparedData p = prepare("c,y\nx,p\nNA,q\n?,p\nnull,q\ny,p\n", missing(TableOptions.Missing.IMPUTE));
        assertEquals(List.of("c=x", "c=y", "c=(missing)"), p.all().featureNames());
        assertEquals(3, p.table().columns().get(0).missing());
    }
}
