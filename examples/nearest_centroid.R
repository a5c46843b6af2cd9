# A headroom trainer in R: nearest centroid on features standardised with the training rows'
# means and standard deviations. Writes one column `prediction` holding class names.
label <- Sys.getenv("HEADROOM_LABEL")
train <- read.csv(Sys.getenv("HEADROOM_TRAIN"), check.names = FALSE, colClasses = "character")
test <- read.csv(Sys.getenv("HEADROOM_TEST"), check.names = FALSE, colClasses = "character")
numbers <- function(table) sapply(table, as.numeric)
x <- matrix(numbers(train[names(test)]), nrow = nrow(train))
z <- matrix(numbers(test), nrow = nrow(test))
y <- trimws(train[[label]])
centre <- colMeans(x)
spread <- apply(x, 2, sd)
spread[!is.finite(spread) | spread == 0] <- 1
x <- sweep(sweep(x, 2, centre), 2, spread, "/")
z <- sweep(sweep(z, 2, centre), 2, spread, "/")
classes <- sort(unique(y))
centroids <- do.call(rbind, lapply(classes, function(k) colMeans(x[y == k, , drop = FALSE])))
distances <- sapply(seq_along(classes), function(k) rowSums(sweep(z, 2, centroids[k, ])^2))
nearest <- apply(matrix(distances, nrow = nrow(z)), 1, which.min)
write.csv(data.frame(prediction = classes[nearest]), Sys.getenv("HEADROOM_PREDICTIONS"), row.names = FALSE)
