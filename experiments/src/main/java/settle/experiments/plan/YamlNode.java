package settle.experiments.plan;

import java.math.BigInteger;
import java.util.ArrayList;
import java.util.Collections;
import java.util.LinkedHashMap;
import java.util.List;
import java.util.Map;
import settle.input.BadInputException;

/**
 * A YAML value with the position it was written at: a map (keys in file order, each with the position of the
 * key), a list, or a scalar (its text as written and its YAML type). Jackson's own tree forgets positions,
 * which every plan error needs.
 */
abstract class YamlNode {

    /** 1-based line and column of the node's first character. */
    final int line;
    final int column;

    YamlNode(int line, int column) {
        this.line = line;
        this.column = column;
    }

    /** @return a short description of the node's type for messages ("a map", "a list", "'fast'") */
    abstract String describe();

    /** @return the plain Java value: LinkedHashMap, ArrayList, String, Integer/Long/BigInteger, Double, Boolean, null */
    abstract Object toJava();

    /** A map; keys unique, in file order. */
    static final class MapNode extends YamlNode {
        final Map<String, Entry> entries = new LinkedHashMap<>();

        MapNode(int line, int column) {
            super(line, column);
        }

        @Override
        String describe() {
            return entries.isEmpty() ? "an empty map" : "a map";
        }

        @Override
        Object toJava() {
            Map<String, Object> m = new LinkedHashMap<>();
            for (Entry e : entries.values()) {
                m.put(e.key, e.value.toJava());
            }
            return m;
        }
    }

    /** One key of a map: the key, where the key was written, and its value. */
    static final class Entry {
        final String key;
        final int keyLine;
        final int keyColumn;
        final YamlNode value;

        Entry(String key, int keyLine, int keyColumn, YamlNode value) {
            this.key = key;
            this.keyLine = keyLine;
            this.keyColumn = keyColumn;
            this.value = value;
        }
    }

    /** A sequence. */
    static final class ListNode extends YamlNode {
        final List<YamlNode> items = new ArrayList<>();

        ListNode(int line, int column) {
            super(line, column);
        }

        @Override
        String describe() {
            return items.isEmpty() ? "an empty list" : "a list";
        }

        @Override
        Object toJava() {
            List<Object> l = new ArrayList<>();
            for (YamlNode n : items) {
                l.add(n.toJava());
            }
            return l;
        }

        List<YamlNode> items() {
            return Collections.unmodifiableList(items);
        }
    }

    /** The YAML type of a scalar, as the parser resolved it. */
    enum ScalarType { STRING, INTEGER, FLOAT, BOOLEAN, NULL }

    /** A scalar: its text exactly as written (quotes removed) and its resolved value. */
    static final class Scalar extends YamlNode {
        final ScalarType type;
        final String text;
        final Object value;

        Scalar(int line, int column, ScalarType type, String text, Object value) {
            super(line, column);
            this.type = type;
            this.text = text;
            this.value = value;
        }

        @Override
        String describe() {
            return type == ScalarType.NULL ? "no value" : BadInputException.shown(text);
        }

        @Override
        Object toJava() {
            if (value instanceof BigInteger b && b.bitLength() < 64) {
                return b.bitLength() < 32 ? (Object) b.intValue() : (Object) b.longValue();
            }
            if (value instanceof Long l && l == l.intValue()) {
                return l.intValue();
            }
            return value;
        }
    }
}
