package settle.datasets.bundled;

import settle.datasets.DataException;
import settle.datasets.Dataset;

/** The bundled open datasets (registry filled in with the resources). */
public final class BundledData {

    private BundledData() {
    }

    /** @return the bundled dataset {@code name} */
    public static Dataset load(String name, String labelColumn) {
        throw new DataException("bundled:" + name + ": bundled data are not in this build yet; expected csv:, "
                + "libsvm: or synthetic: sources");
    }
}
