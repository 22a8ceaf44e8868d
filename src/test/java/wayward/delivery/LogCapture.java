package wayward.delivery;

import ch.qos.logback.classic.Logger;
import ch.qos.logback.classic.spi.ILoggingEvent;
import ch.qos.logback.core.read.ListAppender;
import java.util.List;
import org.slf4j.LoggerFactory;

/** Collects the formatted log lines of one class (or logger) while a test runs. */
public final class LogCapture implements AutoCloseable {
    private final Logger logger;
    private final ListAppender<ILoggingEvent> appender = new ListAppender<>();

    public LogCapture(Class<?> source) {
        this(source.getName());
    }

    /** The lines of the logger of that name. */
    public LogCapture(String name) {
        logger = (Logger) LoggerFactory.getLogger(name);
        appender.start();
        logger.addAppender(appender);
    }

    public List<String> lines() {
        synchronized (appender) { // AppenderBase.doAppend adds to the list holding the appender's lock
            return appender.list.stream().map(e -> e.getLevel() + " " + e.getFormattedMessage()).toList();
        }
    }

    @Override
    public void close() {
        logger.detachAppender(appender);
    }
}
