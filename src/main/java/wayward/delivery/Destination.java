package wayward.delivery;

import java.util.concurrent.CompletableFuture;
import wayward.event.Event;

/**
 * A destination fed from the durable outbox (webhook, MQTT). Its {@link Courier} hands it event phases in
 * outbox order, up to {@link #window()} at a time, and persists its progress as the answers come in.
 */
public interface Destination extends AutoCloseable {
    /** A short name for logs, e.g. "webhook https://host/path". */
    String name();

    /** A stable, file-name-safe key for the destination's progress file. */
    String key();

    /** Event phases that may be outstanding at once (1 = one after the other). */
    default int window() {
        return 1;
    }

    /**
     * Starts delivering one event phase. The future completes with the outcome; it never completes
     * exceptionally. Called by the courier thread only.
     *
     * @param seq the phase's position in the outbox
     */
    CompletableFuture<Result> send(long seq, Event event);

    /** Called by the courier when it has delivered everything in the outbox for the first time since start. */
    default void caughtUp() {
    }

    @Override
    default void close() {
    }

    /** How one attempt ended. */
    enum Status {
        /** Accepted by the destination. */
        DELIVERED,
        /** Refused for good (e.g. HTTP 400); not retried. */
        REFUSED,
        /** Failed for now (down, timeout, 5xx); tried again after a backoff. */
        RETRY
    }

    /** The outcome of one attempt, with a reason for the log when it was not delivered. */
    record Result(Status status, String detail) {
        public static final Result DELIVERED = new Result(Status.DELIVERED, "");

        public static Result refused(String why) {
            return new Result(Status.REFUSED, why);
        }

        public static Result retry(String why) {
            return new Result(Status.RETRY, why);
        }
    }
}
