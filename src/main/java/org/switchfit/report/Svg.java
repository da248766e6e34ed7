package org.switchfit.report;

/** Escaping and number formatting shared by the SVG and HTML writers. Stateless. */
final class Svg {
    private Svg() {
    }

    /** Largest pixel coordinate written; values beyond are clamped (they lie far outside any clip region). */
    static final double MAX_PIXEL = 1e6;

    /**
     * Escapes text for XML/HTML character data and attribute values (both quote styles): {@code & < > " '}.
     * Characters not allowed in XML 1.0 (C0 controls other than tab, newline, carriage return; lone surrogates;
     * U+FFFE, U+FFFF) become U+FFFD so the output always parses. Null becomes the empty string.
     */
    static String esc(String s) {
        if (s == null) {
            return "";
        }
        StringBuilder sb = new StringBuilder(s.length() + 16);
        for (int i = 0; i < s.length(); i++) {
            char c = s.charAt(i);
            switch (c) {
                case '&' -> sb.append("&amp;");
                case '<' -> sb.append("&lt;");
                case '>' -> sb.append("&gt;");
                case '"' -> sb.append("&quot;");
                case '\'' -> sb.append("&#39;");
                default -> {
                    if (Character.isHighSurrogate(c) && i + 1 < s.length()
                            && Character.isLowSurrogate(s.charAt(i + 1))) {
                        sb.append(c).append(s.charAt(++i));
                    } else if ((c < 0x20 && c != '\t' && c != '\n' && c != '\r') || Character.isSurrogate(c)
                            || c == '\uFFFE' || c == '\uFFFF') {
                        sb.append('\uFFFD');
                    } else {
                        sb.append(c);
                    }
                }
            }
        }
        return sb.toString();
    }

    /** Appends a pixel coordinate with at most two decimals, clamped to +-{@link #MAX_PIXEL}. */
    static StringBuilder num(StringBuilder sb, double v) {
        double c = Math.max(-MAX_PIXEL, Math.min(MAX_PIXEL, v));
        long r = Math.round(c * 100);
        if (r < 0) {
            sb.append('-');
            r = -r;
        }
        sb.append(r / 100);
        long frac = r % 100;
        if (frac != 0) {
            sb.append('.');
            if (frac < 10) {
                sb.append('0').append(frac);
            } else if (frac % 10 == 0) {
                sb.append(frac / 10);
            } else {
                sb.append(frac);
            }
        }
        return sb;
    }

    /** A pixel coordinate as a string; see {@link #num(StringBuilder, double)}. */
    static String num(double v) {
        return num(new StringBuilder(12), v).toString();
    }

    /** Keeps only characters safe in an XML id: letters, digits, '-' and '_'; prefixes 'f' if it must. */
    static String safeId(String s) {
        StringBuilder sb = new StringBuilder();
        for (int i = 0; i < s.length(); i++) {
            char c = s.charAt(i);
            sb.append((c >= 'a' && c <= 'z') || (c >= 'A' && c <= 'Z') || (c >= '0' && c <= '9') || c == '-'
                    || c == '_' ? c : '_');
        }
        if (sb.length() == 0 || !Character.isLetter(sb.charAt(0))) {
            sb.insert(0, 'f');
        }
        return sb.toString();
    }
}
