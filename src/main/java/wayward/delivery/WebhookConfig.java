package wayward.delivery;

import java.util.Map;
import wayward.secret.Urls;

/**
 * One {@code [[webhook]]} table.
 *
 * @param url               http:// or https:// address that receives a POST per event phase
 * @param timeoutSeconds    connect plus answer time allowed per attempt
 * @param maxBackoffSeconds longest wait between attempts (failed attempts are retried until delivered)
 * @param headers           extra request headers, in file order
 * @param caFile            PEM file of extra certificate authorities trusted for https, besides the JDK's, or null
 * @param secretFile        file holding the signing secret, or null for unsigned posts
 * @param secret            the secret's bytes (never logged or printed), or null
 */
public record WebhookConfig(String url, double timeoutSeconds, double maxBackoffSeconds, Map<String, String> headers,
        String caFile, String secretFile, byte[] secret) {
    /** Seconds an attempt may take ({@code timeout_seconds}). */
    public static final double DEFAULT_TIMEOUT_SECONDS = 5.0;
    /** Longest wait between attempts ({@code max_backoff_seconds}). */
    public static final double DEFAULT_MAX_BACKOFF_SECONDS = 60;

    public WebhookConfig {
        headers = java.util.Collections.unmodifiableMap(new java.util.LinkedHashMap<>(headers));
    }

    /** Defaults for everything but the address and the timeout (tests). */
    public WebhookConfig(String url, double timeoutSeconds) {
        this(url, timeoutSeconds, 60, Map.of(), null, null, null);
    }

    @Override
    public String toString() {
        // the record's own toString would show the secret and header values (often tokens)
        return "WebhookConfig[url=" + Urls.mask(url) + ", secretFile=" + secretFile + "]";
    }
}
