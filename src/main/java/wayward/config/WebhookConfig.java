package wayward.config;

/**
 * One {@code [[webhook]]} table.
 *
 * @param url            http:// or https:// address that receives a POST per event phase
 * @param timeoutSeconds connect plus answer time allowed per attempt
 * @param retries        further attempts after a failed one
 * @param secretFile     file holding the signing secret, or null for unsigned posts
 * @param secret         the secret's bytes (never logged or printed), or null
 */
public record WebhookConfig(String url, double timeoutSeconds, int retries, String secretFile, byte[] secret) {
    public WebhookConfig(String url, double timeoutSeconds, int retries) {
        this(url, timeoutSeconds, retries, null, null);
    }

    @Override
    public String toString() {
        // the record's own toString would show the secret
        return "WebhookConfig[url=" + ConfigPrinter.maskUrl(url) + ", secretFile=" + secretFile + "]";
    }
}
