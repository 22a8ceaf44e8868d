package wayward.config;

/**
 * One {@code [[webhook]]} table.
 *
 * @param url            http:// or https:// address that receives a POST per event phase
 * @param timeoutSeconds connect plus answer time allowed per attempt
 * @param retries        further attempts after a failed one
 */
public record WebhookConfig(String url, double timeoutSeconds, int retries) {
}
