package settle.datasets.bundled;

import java.io.ByteArrayInputStream;
import java.io.IOException;
import java.io.InputStream;
import java.security.MessageDigest;
import java.security.NoSuchAlgorithmException;
import java.util.ArrayList;
import java.util.HexFormat;
import java.util.List;
import settle.input.BadInputException;
import settle.datasets.Dataset;
import settle.datasets.io.CsvReader;

/**
 * The four bundled open datasets ({@code bundled:NAME}), with their provenance.
 *
 * <p>The resources are the copies shipped in Debian's {@code python3-sklearn} 1.2.1 under
 * {@code sklearn/datasets/data/}, converted by {@code datasets/src/main/bundled/make_bundled.py}: values copied as
 * written, integer targets replaced by string labels (WDBC's copy codes malignant as 0: it is relabelled so that
 * the sorted classes are benign &lt; malignant and malignant is class 1, the positive class). Each resource's
 * SHA-256 is checked on every load.
 *
 * <p>All four come from the UCI Machine Learning Repository, whose datasets are licensed under CC BY 4.0
 * (credit UCI and the original creators).
 */
public final class BundledData {

    /** The repository credit shown with every bundled dataset. */
    public static final String REPOSITORY = "UCI Machine Learning Repository, "
            + "https://archive.ics.uci.edu";

    private static final String LICENCE = "CC BY 4.0 (Creative Commons Attribution 4.0 International), "
            + "as the UCI Machine Learning Repository licenses its datasets";

    private static final String DEBIAN = "Debian python3-sklearn 1.2.1, sklearn/datasets/data/";

    private static final List<BundledDataset> ALL = List.of(
            new BundledDataset("wdbc", "Breast Cancer Wisconsin (Diagnostic)", "wdbc.csv",
                    "af399a019264f7999e6b395ee90576e46564867aa4c8a40797c96be87dc1be55", "diagnosis", 569, 30,
                    List.of("benign", "malignant"), List.of(357, 212),
                    DEBIAN + "breast_cancer.csv (relabelled 0 = malignant, 1 = benign)", LICENCE,
                    "W. H. Wolberg, W. N. Street, O. L. Mangasarian (University of Wisconsin); donor N. Street, 1995",
                    "W. N. Street, W. H. Wolberg, O. L. Mangasarian, \"Nuclear feature extraction for breast tumor "
                            + "diagnosis\", IS&T/SPIE 1993 International Symposium on Electronic Imaging: Science and "
                            + "Technology, vol. 1905, pp. 861-870, 1993; UCI doi:10.24432/C5DW2B"),
            new BundledDataset("iris", "Iris", "iris.csv",
                    "f7fac79ad999fd2d001fd012dd70c0f42c738a7e7cfb7069e71371b55c29341e", "species", 150, 4,
                    List.of("setosa", "versicolor", "virginica"), List.of(50, 50, 50),
                    DEBIAN + "iris.csv (the copy with the two UCI data points corrected, as in R)", LICENCE,
                    "R. A. Fisher; donor M. Marshall, 1988",
                    "R. A. Fisher, \"The use of multiple measurements in taxonomic problems\", Annals of Eugenics "
                            + "7(2):179-188, 1936; UCI doi:10.24432/C56C76"),
            new BundledDataset("wine", "Wine", "wine.csv",
                    "d3fcd1284adcc1c3c1ecc37221dbf2e73d7c3f7a132fbd36525ab1b97baa741b", "cultivar", 178, 13,
                    List.of("class_0", "class_1", "class_2"), List.of(59, 71, 48),
                    DEBIAN + "wine_data.csv (classes: the three cultivars)", LICENCE,
                    "M. Forina et al. (Institute of Pharmaceutical and Food Analysis and Technologies, Genoa); "
                            + "donor S. Aeberhard, 1991",
                    "M. Forina et al., \"PARVUS - An Extendible Package for Data Exploration, Classification and "
                            + "Correlation\", Institute of Pharmaceutical and Food Analysis and Technologies, Genoa; "
                            + "UCI doi:10.24432/C5PC7J"),
            new BundledDataset("optdigits", "Optical Recognition of Handwritten Digits (8x8, test file)",
                    "optdigits.csv", "592cc047d0a1cc7fdef9fd724514209dcb45a80aa147dc3ab375e3e1a9a380f4", "digit",
                    1797, 64, List.of("0", "1", "2", "3", "4", "5", "6", "7", "8", "9"),
                    List.of(178, 182, 177, 183, 181, 182, 181, 179, 174, 180),
                    DEBIAN + "digits.csv.gz (the UCI file optdigits.tes)", LICENCE,
                    "E. Alpaydin, C. Kaynak (Bogazici University), 1998",
                    "C. Kaynak, \"Methods of Combining Multiple Classifiers and Their Applications to Handwritten "
                            + "Digit Recognition\", MSc thesis, Bogazici University, 1995; E. Alpaydin, C. Kaynak, "
                            + "\"Cascading Classifiers\", Kybernetika, 1998; UCI doi:10.24432/C50P49"));

    private BundledData() {
    }

    /** @return the registry, in the order {@code settle datasets} lists it */
    public static List<BundledDataset> all() {
        return ALL;
    }

    /** @return the names accepted after {@code bundled:} */
    public static List<String> names() {
        List<String> names = new ArrayList<>();
        for (BundledDataset d : ALL) {
            names.add(d.name());
        }
        return names;
    }

    /**
     * @return the registry entry of {@code name}
     * @throws BadInputException for an unknown name (the message lists the known ones)
     */
    public static BundledDataset entry(String name) {
        for (BundledDataset d : ALL) {
            if (d.name().equals(name)) {
                return d;
            }
        }
        throw BadInputException.inFile("bundled:" + name, "", "no such bundled dataset; expected one of "
                + String.join(", ", names()));
    }

    /**
     * Loads a bundled dataset after checking its resource's SHA-256.
     *
     * @param name wdbc, iris, wine or optdigits
     * @param labelColumn null, or the dataset's own label column name
     * @return the dataset, named {@code bundled:NAME}
     * @throws BadInputException for an unknown name or another label column
     * @throws IllegalStateException when the resource is missing or altered (a damaged build)
     */
    public static Dataset load(String name, String labelColumn) {
        BundledDataset entry = entry(name);
        if (labelColumn != null && !labelColumn.equals(entry.labelColumn())) {
            throw BadInputException.inFile("bundled:" + name, "", "the label column is '" + entry.labelColumn()
                    + "', not '" + labelColumn + "'; expected no label option or '" + entry.labelColumn() + "'");
        }
        byte[] bytes;
        try (InputStream in = BundledData.class.getResourceAsStream(entry.resource())) {
            if (in == null) {
                throw new IllegalStateException("bundled:" + name + ": resource " + entry.resource()
                        + " is missing from the build; expected it in settle/datasets/bundled/");
            }
            bytes = in.readAllBytes();
        } catch (IOException e) {
            throw new java.io.UncheckedIOException("bundled:" + name + ": cannot read resource " + entry.resource() + ": "
                    + e.getMessage(), e);
        }
        return verifyAndRead(entry, bytes);
    }

    /** Checks {@code bytes} against the entry's SHA-256, then reads them; package-private for tests. */
    static Dataset verifyAndRead(BundledDataset entry, byte[] bytes) {
        String found = sha256(bytes);
        if (!found.equals(entry.sha256())) {
            throw new IllegalStateException("bundled:" + entry.name() + ": resource " + entry.resource()
                    + " has SHA-256 " + found + ", expected " + entry.sha256()
                    + "; the build is damaged: rebuild settle");
        }
        return CsvReader.read(new ByteArrayInputStream(bytes), "bundled:" + entry.name(), entry.labelColumn(), ',');
    }

    /** @return the SHA-256 of {@code bytes}, lower-case hex */
    public static String sha256(byte[] bytes) {
        try {
            return HexFormat.of().formatHex(MessageDigest.getInstance("SHA-256").digest(bytes));
        } catch (NoSuchAlgorithmException e) {
            throw new IllegalStateException("SHA-256 is required of every Java platform", e);
        }
    }
}
