package wayward.delivery;

import java.nio.charset.StandardCharsets;
import java.security.InvalidKeyException;
import java.security.NoSuchAlgorithmException;
import javax.crypto.Mac;
import javax.crypto.spec.SecretKeySpec;

/**
 * Signs webhook bodies so receivers can tell them from forgeries: HMAC-SHA256 (RFC 2104 with SHA-256, test
 * vectors in RFC 4231) over {@code TIMESTAMP + "." + BODY}, where TIMESTAMP is the Unix time in seconds sent
 * in {@link #TIMESTAMP_HEADER}; the result goes, as {@code sha256=} and lower-case hex, in
 * {@link #SIGNATURE_HEADER}. Receivers recompute it with the shared secret, compare in constant time, and
 * refuse old timestamps (replays). Thread-safe; allocates per call.
 */
public final class WebhookSignature {
    public static final String TIMESTAMP_HEADER = "X-Wayward-Timestamp";
    public static final String SIGNATURE_HEADER = "X-Wayward-Signature";

    private final SecretKeySpec key;

    public WebhookSignature(byte[] secret) {
        if (secret.length == 0) {
            throw new IllegalArgumentException("secret: empty (expected at least one byte)");
        }
        this.key = new SecretKeySpec(secret, "HmacSHA256");
    }

    /** The header value for a body sent at {@code unixSeconds}. */
    public String sign(long unixSeconds, byte[] body) {
        byte[] prefix = (unixSeconds + ".").getBytes(StandardCharsets.US_ASCII);
        byte[] message = new byte[prefix.length + body.length];
        System.arraycopy(prefix, 0, message, 0, prefix.length);
        System.arraycopy(body, 0, message, prefix.length, body.length);
        return "sha256=" + hex(hmacSha256(key, message));
    }

    static byte[] hmacSha256(SecretKeySpec key, byte[] message) {
        try {
            Mac mac = Mac.getInstance("HmacSHA256");
            mac.init(key);
            return mac.doFinal(message);
        } catch (NoSuchAlgorithmException | InvalidKeyException e) {
            throw new IllegalStateException("HmacSHA256 unavailable in this JDK", e);
        }
    }

    /** HMAC-SHA256 of a message with a raw key, as lower-case hex (for tests against RFC 4231). */
    public static String hmacSha256Hex(byte[] key, byte[] message) {
        return hex(hmacSha256(new SecretKeySpec(key, "HmacSHA256"), message));
    }

    private static String hex(byte[] b) {
        char[] digits = "0123456789abcdef".toCharArray();
        char[] out = new char[b.length * 2];
        for (int i = 0; i < b.length; i++) {
            out[2 * i] = digits[(b[i] >> 4) & 0xf];
            out[2 * i + 1] = digits[b[i] & 0xf];
        }
        return new String(out);
    }
}
