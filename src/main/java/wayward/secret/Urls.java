package wayward.secret;


/**
 * URLs as they may leave the process (logs, {@code check}, the status API): the one place where a URL's password
 * and query string are hidden. Cameras, webhooks and brokers all pass their URLs through {@link #mask}.
 */
public final class Urls {
    private Urls() {
    }

    /** A scheme followed by {@code ://}. */
    public static boolean isUrl(String s) {
        int i = s.indexOf("://");
        return i > 0 && s.substring(0, i).matches("[A-Za-z][A-Za-z0-9+.-]*");
    }

    /** Where a URL starts inside free text: a scheme and "://". */
    private static final java.util.regex.Pattern IN_TEXT =
            java.util.regex.Pattern.compile("[A-Za-z][A-Za-z0-9+.-]*://[^\\s'\"<>]+");

    /**
     * Free text (an FFmpeg or socket error message) with every URL in it masked: such messages quote the address
     * they failed on, password included.
     */
    public static String maskIn(String text) {
        if (text == null || text.indexOf("://") < 0) {
            return text;
        }
        java.util.regex.Matcher m = IN_TEXT.matcher(text);
        StringBuilder b = new StringBuilder();
        while (m.find()) {
            m.appendReplacement(b, java.util.regex.Matcher.quoteReplacement(mask(m.group())));
        }
        m.appendTail(b);
        return b.toString();
    }

    /**
     * A URL fit for logs: the password of user:password@ becomes ***, and a query string (where tokens tend to
     * live) becomes ?***. Non-URLs come back unchanged. The user information runs to the <em>last</em> '@' of
     * the URL, so a password holding a raw '@', '#', '/', '?' or a space is hidden whole (FFmpeg reads such an
     * address the same way or not at all); a path holding '@' after the host may be masked too, which is safe.
     */
    public static String mask(String s) {
        if (!isUrl(s)) {
            return s;
        }
        final int start = s.indexOf("://") + 3;
        final int at = s.lastIndexOf('@');
        StringBuilder b = new StringBuilder(s.length());
        int rest = start;
        b.append(s, 0, start);
        if (at >= start) {
            String user = s.substring(start, at);
            int colon = user.indexOf(':');
            if (colon >= 0) {
                b.append(user, 0, colon).append(":***@");
                rest = at + 1;
            } else if (user.indexOf('/') < 0 && user.indexOf('?') < 0 && user.indexOf('#') < 0) {
                b.append(user).append('@'); // a user name alone: nothing secret
                rest = at + 1;
            }
        }
        int query = s.indexOf('?', rest);
        if (query >= 0) {
            int fragment = s.indexOf('#', query);
            b.append(s, rest, query).append("?***").append(fragment >= 0 ? s.substring(fragment) : "");
        } else {
            b.append(s, rest, s.length());
        }
        return b.toString();
    }

    /**
     * The first character of a URL's password that FFmpeg cannot take raw ('/', '?' or '#': they end the host part
     * of an address before the '@' is reached), or 0 when there is none or no password. Such characters must be
     * percent-encoded (%2F, %3F, %23).
     */
    public static char reservedInPassword(String s) {
        if (!isUrl(s)) {
            return 0;
        }
        final int start = s.indexOf("://") + 3;
        final int at = s.lastIndexOf('@');
        if (at < start) {
            return 0;
        }
        int colon = s.indexOf(':', start);
        if (colon < 0 || colon > at) {
            return 0;
        }
        for (int i = colon + 1; i < at; i++) {
            char c = s.charAt(i);
            if (c == '/' || c == '?' || c == '#') {
                return c;
            }
        }
        return 0;
    }
}
