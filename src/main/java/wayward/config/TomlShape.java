package wayward.config;

import java.nio.ByteBuffer;
import java.nio.CharBuffer;
import java.nio.charset.CharacterCodingException;
import java.nio.charset.CharsetDecoder;
import java.nio.charset.CodingErrorAction;
import java.nio.charset.StandardCharsets;
import java.util.List;

/**
 * Checks on a config file's text before the TOML parser sees it, each failing with one located line: the bytes
 * must be UTF-8 (TOML 1.0), and arrays and inline tables may nest at most {@link #MAX_NESTING} deep (the parser
 * recurses once per level: a thousand levels overflow its stack; no config needs more than three).
 */
final class TomlShape {
    static final int MAX_NESTING = 32;

    private TomlShape() {
    }

    /** The file's text; a ConfigException naming line and column of the first byte that is not UTF-8. */
    static String text(byte[] bytes, String shown) throws ConfigException {
        CharsetDecoder d = StandardCharsets.UTF_8.newDecoder().onMalformedInput(CodingErrorAction.REPORT)
                .onUnmappableCharacter(CodingErrorAction.REPORT);
        try {
            return d.decode(ByteBuffer.wrap(bytes)).toString();
        } catch (CharacterCodingException e) {
            // decode up to the first bad byte to say where it is
            ByteBuffer in = ByteBuffer.wrap(bytes);
            CharBuffer out = CharBuffer.allocate(bytes.length);
            StandardCharsets.UTF_8.newDecoder().onMalformedInput(CodingErrorAction.REPORT)
                    .onUnmappableCharacter(CodingErrorAction.REPORT).decode(in, out, true);
            out.flip();
            int[] lc = lineColumn(out, out.length());
            throw new ConfigException(List.of(shown + ":" + lc[0] + ":" + lc[1] + ": not UTF-8 text at byte "
                    + in.position() + " (expected a TOML file, which is UTF-8 text)"));
        }
    }

    /** Refuses arrays and inline tables nested deeper than {@link #MAX_NESTING}, naming the first too deep. */
    static void checkNesting(String s, String shown) throws ConfigException {
        int depth = 0;
        for (int i = 0; i < s.length(); i++) {
            char c = s.charAt(i);
            if (c == '#') {
                while (i < s.length() && s.charAt(i) != '\n') {
                    i++;
                }
            } else if (c == '"' || c == '\'') {
                boolean multi = s.startsWith(String.valueOf(c).repeat(3), i);
                String end = multi ? String.valueOf(c).repeat(3) : String.valueOf(c);
                i += multi ? 3 : 1;
                while (i < s.length() && !s.startsWith(end, i) && (multi || s.charAt(i) != '\n')) {
                    i += c == '"' && s.charAt(i) == '\\' ? 2 : 1;
                }
                i += end.length() - 1;
            } else if (c == '[' || c == '{') {
                if (++depth > MAX_NESTING) {
                    int[] lc = lineColumn(s, i);
                    throw new ConfigException(List.of(shown + ":" + lc[0] + ":" + lc[1] + ": arrays or tables nested "
                            + "more than " + MAX_NESTING + " deep (expected a config; none needs more than three)"));
                }
            } else if (c == ']' || c == '}') {
                depth = Math.max(0, depth - 1);
            }
        }
    }

    /**
     * The text with a space put between a date or time and a {@code ]} that directly follows it, and where each
     * space went ({line, column} in the returned text, 1-based). tomlj 1.1.1 misreads what follows such an array
     * ({@code off_dates = [2026-12-24]} then any key: "Unexpected ..., expected a newline"), though it is valid TOML
     * 1.0; with the space it reads it right. Error positions on those lines are shifted back by {@link ConfigErrors}.
     */
    static Padded padDatesBeforeBrackets(String s) {
        StringBuilder out = new StringBuilder(s.length());
        List<int[]> spaces = new java.util.ArrayList<>();
        int line = 1;
        int lineStart = 0;
        for (int i = 0; i < s.length(); i++) {
            char c = s.charAt(i);
            if (c == '#') {
                int end = s.indexOf('\n', i);
                end = end < 0 ? s.length() : end;
                out.append(s, i, end);
                i = end - 1;
                continue;
            }
            if (c == '"' || c == '\'') {
                boolean multi = s.startsWith(String.valueOf(c).repeat(3), i);
                String close = multi ? String.valueOf(c).repeat(3) : String.valueOf(c);
                int j = i + (multi ? 3 : 1);
                while (j < s.length() && !s.startsWith(close, j) && (multi || s.charAt(j) != '\n')) {
                    j += c == '"' && s.charAt(j) == '\\' ? 2 : 1;
                }
                int end = Math.min(s.length(), j + close.length());
                for (int k = i; k < end; k++) {
                    if (s.charAt(k) == '\n') {
                        line++;
                        lineStart = out.length() + (k - i) + 1;
                    }
                }
                out.append(s, i, end);
                i = end - 1;
                continue;
            }
            if (c == ']' && endsWithDate(s, i)) {
                spaces.add(new int[] {line, out.length() - lineStart + 1});
                out.append(' ');
            }
            out.append(c);
            if (c == '\n') {
                line++;
                lineStart = out.length();
            }
        }
        return new Padded(out.toString(), spaces);
    }

    /** The text to parse and where spaces were put in it ({line, column}). */
    record Padded(String text, List<int[]> spaces) {
    }

    /** True when the value that ends just before {@code end} is a TOML date or time (RFC 3339 forms). */
    private static boolean endsWithDate(String s, int end) {
        int start = end;
        while (start > 0 && " \t,[".indexOf(s.charAt(start - 1)) < 0) {
            start--;
        }
        return s.substring(start, end).matches("[0-9]{4}-[0-9]{2}-[0-9]{2}.*|[0-9]{2}:[0-9]{2}.*");
    }

    private static int[] lineColumn(CharSequence s, int upTo) {
        int line = 1;
        int column = 1;
        for (int i = 0; i < upTo; i++) {
            if (s.charAt(i) == '\n') {
                line++;
                column = 1;
            } else {
                column++;
            }
        }
        return new int[] {line, column};
    }
}
