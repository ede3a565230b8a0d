// Binomial tail bounds for tests that count successes of a seeded procedure.

/** P(X ≤ x) for X ~ Binomial(n, p), by summing the probability mass function. */
export function binomialCdf(x: number, n: number, p: number): number {
  let pmf = (1 - p) ** n
  let cdf = pmf
  for (let k = 1; k <= x; k++) {
    pmf *= ((n - k + 1) / k) * (p / (1 - p))
    cdf += pmf
  }
  return cdf
}

/** [low, high]: a Binomial(n, p) count falls below low, or above high, with probability ≤ tail each. */
export function binomialBounds(n: number, p: number, tail = 0.001): [number, number] {
  let low = 0
  while (binomialCdf(low, n, p) < tail) low++
  let high = n
  while (1 - binomialCdf(high - 1, n, p) < tail) high--
  return [low, high]
}
