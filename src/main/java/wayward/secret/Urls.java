package wayward.secret;

import java.net.URI;
import java.net.URISyntaxException;

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
     * live) becomes ?***. Non-URLs come back unchanged.
     */
    public static String mask(String s) {
        if (!isUrl(s)) {
            return s;
        }
        try {
            URI u = new URI(s);
            String user = u.getRawUserInfo();
            String masked = s;
            if (user != null) {
                int colon = user.indexOf(':');
                String shown = colon >= 0 ? user.substring(0, colon) + ":***" : user;
                masked = masked.replace(user + "@", shown + "@");
            }
            String query = u.getRawQuery();
            if (query != null) {
                masked = masked.replace("?" + query, "?***");
            }
            return masked;
        } catch (URISyntaxException e) {
            // not parseable: hide everything after the scheme's host part rather than risk a secret
            int at = s.lastIndexOf('@');
            return at > 0 ? s.substring(0, s.indexOf("://") + 3) + "***" + s.substring(at) : s;
        }
    }
}
