package settle.reports.format;

import com.fasterxml.jackson.core.JsonFactory;
import com.fasterxml.jackson.core.JsonParser;
import com.fasterxml.jackson.core.JsonToken;
import com.fasterxml.jackson.core.StreamReadFeature;
import java.io.IOException;
import java.nio.file.Files;
import java.nio.file.Path;
import java.util.ArrayList;
import java.util.Arrays;
import java.util.LinkedHashMap;
import java.util.List;
import java.util.Map;
import java.util.Set;

/**
 * A small JSON tree read with Jackson's streaming parser, made for study files: an array of numbers (and nulls)
 * becomes one {@link Numbers} (a {@code double[]}) instead of a node per element, and the subtrees of keys the
 * report never reads are skipped unparsed. Objects are {@code Map<String, Object>} in file order; other arrays
 * {@code List<Object>}; whole numbers {@link Long} (beyond the long range {@link Double}), other numbers
 * {@link Double}; strings, booleans; JSON null is {@link #NULL}. Numbers are the parser's own
 * {@code getDoubleValue()}, as in a Jackson tree.
 */
final class LeanJson {

    /** JSON null. */
    static final Object NULL = new Object() {
        @Override
        public String toString() {
            return "null";
        }
    };

    /**
     * An array whose elements are all numbers or null.
     *
     * @param values the numbers, NaN where the array holds null
     * @param firstNull the index of the first null, or −1
     */
    record Numbers(double[] values, int firstNull) {
        @Override
        public String toString() {
            return "an array of " + values.length + " numbers";
        }
    }

    private static final JsonFactory FACTORY = JsonFactory.builder()
            .enable(StreamReadFeature.USE_FAST_DOUBLE_PARSER).build();

    private LeanJson() {
    }

    /**
     * @param file a JSON file
     * @param skip keys whose values are skipped, at any depth (they are absent from the result)
     * @return the root value
     * @throws com.fasterxml.jackson.core.JsonProcessingException for malformed JSON (with its location)
     */
    static Object read(Path file, Set<String> skip) throws IOException {
        try (JsonParser p = FACTORY.createParser(Files.readAllBytes(file))) {
            JsonToken t = p.nextToken();
            if (t == null) {
                return null;
            }
            return value(p, t, skip, new double[64]);
        }
    }

    private static Object value(JsonParser p, JsonToken t, Set<String> skip, double[] scratch) throws IOException {
        switch (t) {
            case START_OBJECT: {
                Map<String, Object> map = new LinkedHashMap<>();
                for (JsonToken k = p.nextToken(); k != JsonToken.END_OBJECT; k = p.nextToken()) {
                    String name = p.currentName();
                    JsonToken v = p.nextToken();
                    if (skip.contains(name)) {
                        p.skipChildren();
                    } else {
                        map.put(name, value(p, v, skip, scratch));
                    }
                }
                return map;
            }
            case START_ARRAY:
                return array(p, skip, scratch);
            case VALUE_STRING:
                return p.getText();
            case VALUE_NUMBER_INT:
                return p.getNumberType() == JsonParser.NumberType.BIG_INTEGER ? (Object) p.getDoubleValue()
                        : (Object) p.getLongValue();
            case VALUE_NUMBER_FLOAT:
                return p.getDoubleValue();
            case VALUE_TRUE:
                return Boolean.TRUE;
            case VALUE_FALSE:
                return Boolean.FALSE;
            case VALUE_NULL:
                return NULL;
            default:
                throw new IllegalStateException("unexpected JSON token " + t);
        }
    }

    /** Numbers (and nulls) go to a double buffer; the first other element turns the array into a list. */
    private static Object array(JsonParser p, Set<String> skip, double[] scratch) throws IOException {
        double[] buffer = scratch;
        int n = 0;
        int firstNull = -1;
        JsonToken t;
        while ((t = p.nextToken()) != JsonToken.END_ARRAY) {
            double v;
            if (t == JsonToken.VALUE_NUMBER_INT || t == JsonToken.VALUE_NUMBER_FLOAT) {
                v = p.getDoubleValue();
            } else if (t == JsonToken.VALUE_NULL) {
                v = Double.NaN;
                if (firstNull < 0) {
                    firstNull = n;
                }
            } else {
                List<Object> list = new ArrayList<>(n + 4);
                for (int i = 0; i < n; i++) {
                    // JSON has no NaN literal: a NaN in the buffer was a null
                    list.add(Double.isNaN(buffer[i]) ? NULL : (Object) buffer[i]);
                }
                list.add(value(p, t, skip, new double[16]));
                while ((t = p.nextToken()) != JsonToken.END_ARRAY) {
                    list.add(value(p, t, skip, new double[16]));
                }
                return list;
            }
            if (n == buffer.length) {
                buffer = Arrays.copyOf(buffer, buffer.length * 2);
            }
            buffer[n++] = v;
        }
        return new Numbers(Arrays.copyOf(buffer, n), firstNull);
    }
}
