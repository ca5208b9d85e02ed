// Money in minor units: conversion from what people type, tax on the net total rounded half away
// from zero (commercial rounding — common practice for invoice totals, and this product's rule),
// and how amounts are written. Expected values are worked by hand below each check.
import { describe, expect, it } from 'vitest'
import { currencyDigits, formatMoney, minorToDecimal, moneyTextToMinor, percentToBasisPoints, taxOf, toMinor, totalsOf } from '../../../shared/billing/money'

describe('currency minor units (ISO 4217 minor-unit column, through the platform Intl data)', () => {
  it('GBP and EUR have 2 decimals, JPY none, KWD 3', () => {
    expect(currencyDigits('GBP')).toBe(2)
    expect(currencyDigits('EUR')).toBe(2)
    expect(currencyDigits('JPY')).toBe(0)
    expect(currencyDigits('KWD')).toBe(3)
  })
})

describe('toMinor: what people type, in minor units', () => {
  it('takes up to the currency’s decimals exactly, refuses more', () => {
    expect(toMinor(120.5, 2)).toBe(12050)
    // 0.1 + 0.2 is 0.30000000000000004 in binary; it still means 30 pence.
    expect(toMinor(0.1 + 0.2, 2)).toBe(30)
    expect(toMinor(19.99, 2)).toBe(1999)
    expect(toMinor(1234, 0)).toBe(1234)
    expect(toMinor(120.505, 2)).toBeNaN()
    expect(toMinor(0.5, 0)).toBeNaN()
    expect(toMinor(Number.POSITIVE_INFINITY, 2)).toBeNaN()
    expect(percentToBasisPoints(7.7)).toBe(770)
    expect(percentToBasisPoints(20)).toBe(2000)
    expect(percentToBasisPoints(12.345)).toBeNaN()
  })
  it('reads a form box: separators and a leading symbol allowed, nothing else', () => {
    expect(moneyTextToMinor('1,234.5', 2)).toBe(123450)
    expect(moneyTextToMinor(' £ 95 ', 2)).toBe(9500)
    expect(moneyTextToMinor('.5', 2)).toBe(50)
    expect(moneyTextToMinor('', 2)).toBeNaN()
    expect(moneyTextToMinor('-5', 2)).toBeNaN()
    expect(moneyTextToMinor('12a', 2)).toBeNaN()
    expect(moneyTextToMinor('1.234', 2)).toBeNaN()
  })
})

describe('taxOf: tax on a net amount, rounded half away from zero', () => {
  it('matches the hand calculation', () => {
    // 20 % of £123.45 = £24.69 exactly.
    expect(taxOf(12345, 2000)).toBe(2469)
    // 20 % of 3 p = 0.6 p → 1 p; 20 % of 2 p = 0.4 p → 0 p.
    expect(taxOf(3, 2000)).toBe(1)
    expect(taxOf(2, 2000)).toBe(0)
    // 2.5 % of 10 p = 0.25 p → 0 p; 2.5 % of 20 p = 0.5 p → 1 p (the half goes away from zero).
    expect(taxOf(10, 250)).toBe(0)
    expect(taxOf(20, 250)).toBe(1)
    // A credit: the same amount with the sign.
    expect(taxOf(-20, 250)).toBe(-1)
    // 7.7 % of 1000.00 = 77.00.
    expect(taxOf(100000, 770)).toBe(7700)
    // Beyond 2^53 in the intermediate product: 10^12 minor × 2000 bp = 2·10^15 … exact: 2·10^11.
    expect(taxOf(1_000_000_000_000, 2000)).toBe(200_000_000_000)
    expect(taxOf(999_999_999_999, 2000)).toBe(200_000_000_000)
  })
  it('totals: net is the sum of the lines, tax on the net once', () => {
    // 1 × £180.00 + 2 × £25.00 = £230.00; 20 % = £46.00; gross £276.00.
    expect(totalsOf([{ quantity: 1, unitPriceMinor: 18000 }, { quantity: 2, unitPriceMinor: 2500 }], 2000)).toEqual({ netMinor: 23000, taxMinor: 4600, grossMinor: 27600 })
    // Per-line rounding would give 3 × round(0.6 p) = 3 p; on the total, 20 % of 9 p = 1.8 p → 2 p.
    expect(totalsOf([{ quantity: 1, unitPriceMinor: 3 }, { quantity: 1, unitPriceMinor: 3 }, { quantity: 1, unitPriceMinor: 3 }], 2000).taxMinor).toBe(2)
    expect(totalsOf([], 2000)).toEqual({ netMinor: 0, taxMinor: 0, grossMinor: 0 })
  })
})

describe('writing amounts', () => {
  it('for people and for files', () => {
    expect(formatMoney(123450, 'GBP')).toBe('£1,234.50')
    expect(formatMoney(-500, 'EUR')).toBe('\u2212€5.00')
    expect(formatMoney(1234, 'JPY')).toBe('JP¥1,234')
    expect(minorToDecimal(12050, 2)).toBe('120.50')
    expect(minorToDecimal(5, 2)).toBe('0.05')
    expect(minorToDecimal(-5, 2)).toBe('-0.05')
    expect(minorToDecimal(1234, 0)).toBe('1234')
    expect(minorToDecimal(1, 3)).toBe('0.001')
  })
})
