package settle.datasets.bundled;

import java.io.ByteArrayInputStream;
import java.io.IOException;
import java.io.InputStream;
import java.nio.charset.StandardCharsets;
import java.security.MessageDigest;
import java.security.NoSuchAlgorithmException;
import java.util.ArrayList;
import java.util.HexFormat;
import java.util.List;
import settle.input.BadInputException;
import settle.datasets.Dataset;
import settle.datasets.io.CsvReader;
import settle.datasets.table.SourceTable;
import settle.datasets.table.TableReader;

/**
 * The bundled open datasets ({@code bundled:NAME}), with their provenance.
 *
 * <p>The resources are made by {@code datasets/src/main/bundled/make_bundled.py} from two Debian packages:
 * WDBC and wine from the copies in {@code python3-sklearn} 1.2.1 under {@code sklearn/datasets/data/} (WDBC's copy
 * codes malignant as 0: it is relabelled so that the sorted classes are benign &lt; malignant and malignant is class
 * 1, the positive class; wine's classes 1, 2, 3 are written {@code cultivar 1} .. {@code cultivar 3}, the words of
 * its documentation), Satellite and HouseVotes84 from {@code r-cran-mlbench} 2.1-3 (column names from the
 * package's documentation). Values are copied as written. Each resource's SHA-256 is checked on every load.
 *
 * <p>The all-numeric files without gaps are read by {@link CsvReader}; a table with text columns or gaps
 * ({@link BundledDataset#table()}) by the table path ({@link TableReader}), so a plan's {@code data.*} column keys
 * apply to it as to a {@code csv:} table.
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

    private static final String MLBENCH = "R package mlbench 2.1-3 (Debian r-cran-mlbench; converted to R by "
            + "F. Leisch), ";

    private static final List<BundledDataset> ALL = List.of(
            new BundledDataset("wdbc", "Breast Cancer Wisconsin (Diagnostic)", "wdbc.csv", false,
                    "af399a019264f7999e6b395ee90576e46564867aa4c8a40797c96be87dc1be55", "diagnosis", 569, 30,
                    List.of("benign", "malignant"), List.of(357, 212),
                    DEBIAN + "breast_cancer.csv (relabelled 0 = malignant, 1 = benign)", LICENCE,
                    "W. H. Wolberg, W. N. Street, O. L. Mangasarian (University of Wisconsin); donor N. Street, 1995",
                    "W. N. Street, W. H. Wolberg, O. L. Mangasarian, \"Nuclear feature extraction for breast tumor "
                            + "diagnosis\", IS&T/SPIE 1993 International Symposium on Electronic Imaging: Science and "
                            + "Technology, vol. 1905, pp. 861-870, 1993; UCI doi:10.24432/C5DW2B"),
            new BundledDataset("wine", "Wine", "wine.csv", false,
                    "7a9274e5a6b2561050a6c39ca31c3f328b9445599ef5c1ba02a3210b34bee717", "cultivar", 178, 13,
                    List.of("cultivar 1", "cultivar 2", "cultivar 3"), List.of(59, 71, 48),
                    DEBIAN + "wine_data.csv (targets 0, 1, 2 = the UCI file's classes 1, 2, 3, the three cultivars "
                            + "of its description)", LICENCE,
                    "M. Forina et al. (Institute of Pharmaceutical and Food Analysis and Technologies, Genoa); "
                            + "donor S. Aeberhard, 1991",
                    "M. Forina et al., \"PARVUS - An Extendible Package for Data Exploration, Classification and "
                            + "Correlation\", Institute of Pharmaceutical and Food Analysis and Technologies, Genoa; "
                            + "UCI doi:10.24432/C5PC7J"),
            new BundledDataset("satellite", "Statlog (Landsat Satellite)", "satellite.csv", false,
                    "c17324dd69238f4df59b6bf652eaa53d830a423689ac1b9c04c9c389597a110a", "cover", 6435, 36,
                    List.of("cotton crop", "damp grey soil", "grey soil", "red soil", "vegetation stubble",
                            "very damp grey soil"),
                    List.of(703, 626, 1358, 1533, 707, 1508),
                    MLBENCH + "data(Satellite): the UCI training and test files together; x.1 .. x.36 named "
                            + "pixelP.bandB (3x3 neighbourhood, pixels left-to-right, top-to-bottom, centre pixel 5; "
                            + "bands 1-2 visible green and red, 3-4 near infra-red)", LICENCE,
                    "Australian Centre for Remote Sensing (Landsat MSS data from NASA); classes from a site visit by "
                            + "K. Hall (University of New South Wales); donor A. Srinivasan (University of "
                            + "Strathclyde), 1993",
                    "D. Michie, D. J. Spiegelhalter, C. C. Taylor (eds.), \"Machine Learning, Neural and "
                            + "Statistical Classification\", Ellis Horwood, 1994 (the Statlog project); "
                            + "UCI doi:10.24432/C55887"),
            new BundledDataset("housevotes84", "Congressional Voting Records (1984)", "housevotes84.csv", true,
                    "17828eb97d994701728e31435e0073b564521c85be4584a011c444f32138ae8b", "party", 435, 16,
                    List.of("democrat", "republican"), List.of(267, 168),
                    MLBENCH + "data(HouseVotes84): V1 .. V16 named by the 16 votes of its documentation, y/n kept "
                            + "as text, the 392 unknown dispositions as empty cells, Class renamed party and put last",
                    LICENCE,
                    "Congressional Quarterly Almanac, 98th Congress, 2nd session 1984, vol. XL, Congressional "
                            + "Quarterly Inc., 1985; donor J. C. Schlimmer, 1987",
                    "J. C. Schlimmer, \"Concept acquisition through representational adjustment\", PhD thesis, "
                            + "University of California, Irvine, 1987; UCI doi:10.24432/C5C01P"));

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
     * Loads an all-numeric bundled dataset after checking its resource's SHA-256.
     *
     * @param name wdbc, wine or satellite
     * @param labelColumn null, or the dataset's own label column name
     * @return the dataset, named {@code bundled:NAME}
     * @throws BadInputException for an unknown name or another label column
     * @throws IllegalArgumentException for a table entry (read it with {@link #readTable})
     * @throws IllegalStateException when the resource is missing or altered (a damaged build)
     */
    public static Dataset load(String name, String labelColumn) {
        BundledDataset entry = entry(name);
        if (entry.table()) {
            throw new IllegalArgumentException("bundled:" + name + " is a table; read it with readTable");
        }
        checkLabel(entry, labelColumn);
        return verifyAndRead(entry, bytes(entry));
    }

    /**
     * Reads a bundled table (text columns, gaps) through the table path after checking its resource's SHA-256.
     *
     * @param name housevotes84
     * @param labelColumn null, or the dataset's own label column name
     * @return the table as read, named {@code bundled:NAME}
     * @throws BadInputException for an unknown name or another label column
     * @throws IllegalArgumentException for an all-numeric entry (load it with {@link #load})
     * @throws IllegalStateException when the resource is missing or altered (a damaged build)
     */
    public static SourceTable readTable(String name, String labelColumn) {
        BundledDataset entry = entry(name);
        if (!entry.table()) {
            throw new IllegalArgumentException("bundled:" + name + " is all-numeric; load it with load");
        }
        checkLabel(entry, labelColumn);
        byte[] bytes = bytes(entry);
        verify(entry, bytes);
        return TableReader.read(new String(bytes, StandardCharsets.UTF_8), "bundled:" + name, entry.labelColumn(),
                ',');
    }

    private static void checkLabel(BundledDataset entry, String labelColumn) {
        if (labelColumn != null && !labelColumn.equals(entry.labelColumn())) {
            throw BadInputException.inFile("bundled:" + entry.name(), "", "the label column is '"
                    + entry.labelColumn() + "', not '" + labelColumn + "'; expected no label option or '"
                    + entry.labelColumn() + "'");
        }
    }

    private static byte[] bytes(BundledDataset entry) {
        try (InputStream in = BundledData.class.getResourceAsStream(entry.resource())) {
            if (in == null) {
                throw new IllegalStateException("bundled:" + entry.name() + ": resource " + entry.resource()
                        + " is missing from the build; expected it in settle/datasets/bundled/");
            }
            return in.readAllBytes();
        } catch (IOException e) {
            throw new java.io.UncheckedIOException("bundled:" + entry.name() + ": cannot read resource "
                    + entry.resource() + ": " + e.getMessage(), e);
        }
    }

    /** Checks {@code bytes} against the entry's SHA-256, then reads them; package-private for tests. */
    static Dataset verifyAndRead(BundledDataset entry, byte[] bytes) {
        verify(entry, bytes);
        return CsvReader.read(new ByteArrayInputStream(bytes), "bundled:" + entry.name(), entry.labelColumn(), ',');
    }

    private static void verify(BundledDataset entry, byte[] bytes) {
        String found = sha256(bytes);
        if (!found.equals(entry.sha256())) {
            throw new IllegalStateException("bundled:" + entry.name() + ": resource " + entry.resource()
                    + " has SHA-256 " + found + ", expected " + entry.sha256()
                    + "; the build is damaged: rebuild settle");
        }
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
