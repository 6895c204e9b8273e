// US states (and DC) with their statewide base sales-tax rate, in basis points (1/100 of a
// percent; a few states' rates end in a half basis point, e.g. 6.875 % = 687.5).
//
// SOURCE: written from memory by a Tiltwright developer, as of 2026-12-02, to be checked against
// each state's department of revenue before it is relied on. Local (county, city, district)
// add-on rates are NOT included, so the tax on our documents is an estimate: the state base
// rate only. States with no statewide sales tax (AK, DE, MT, NH, OR) charge none here.
// Where a state's published "state rate" includes a mandatory statewide local part (CA 7.25,
// UT 6.10, VA 5.30), that combined statewide rate is used.

export interface UsState {
  code: string
  name: string
  baseRateBasisPoints: number
}

export const US_SALES_TAX_SOURCE
  = 'State base rates written from memory as of 2026-12-02, '
    + 'to be checked against the state revenue departments; local add-on rates not included'

export const US_STATES: readonly UsState[] = [
  { code: 'AL', name: 'Alabama', baseRateBasisPoints: 400 },
  { code: 'AK', name: 'Alaska', baseRateBasisPoints: 0 },
  { code: 'AZ', name: 'Arizona', baseRateBasisPoints: 560 },
  { code: 'AR', name: 'Arkansas', baseRateBasisPoints: 650 },
  { code: 'CA', name: 'California', baseRateBasisPoints: 725 },
  { code: 'CO', name: 'Colorado', baseRateBasisPoints: 290 },
  { code: 'CT', name: 'Connecticut', baseRateBasisPoints: 635 },
  { code: 'DE', name: 'Delaware', baseRateBasisPoints: 0 },
  { code: 'DC', name: 'District of Columbia', baseRateBasisPoints: 600 },
  { code: 'FL', name: 'Florida', baseRateBasisPoints: 600 },
  { code: 'GA', name: 'Georgia', baseRateBasisPoints: 400 },
  { code: 'HI', name: 'Hawaii', baseRateBasisPoints: 400 },
  { code: 'ID', name: 'Idaho', baseRateBasisPoints: 600 },
  { code: 'IL', name: 'Illinois', baseRateBasisPoints: 625 },
  { code: 'IN', name: 'Indiana', baseRateBasisPoints: 700 },
  { code: 'IA', name: 'Iowa', baseRateBasisPoints: 600 },
  { code: 'KS', name: 'Kansas', baseRateBasisPoints: 650 },
  { code: 'KY', name: 'Kentucky', baseRateBasisPoints: 600 },
  { code: 'LA', name: 'Louisiana', baseRateBasisPoints: 500 },
  { code: 'ME', name: 'Maine', baseRateBasisPoints: 550 },
  { code: 'MD', name: 'Maryland', baseRateBasisPoints: 600 },
  { code: 'MA', name: 'Massachusetts', baseRateBasisPoints: 625 },
  { code: 'MI', name: 'Michigan', baseRateBasisPoints: 600 },
  { code: 'MN', name: 'Minnesota', baseRateBasisPoints: 687.5 },
  { code: 'MS', name: 'Mississippi', baseRateBasisPoints: 700 },
  { code: 'MO', name: 'Missouri', baseRateBasisPoints: 422.5 },
  { code: 'MT', name: 'Montana', baseRateBasisPoints: 0 },
  { code: 'NE', name: 'Nebraska', baseRateBasisPoints: 550 },
  { code: 'NV', name: 'Nevada', baseRateBasisPoints: 685 },
  { code: 'NH', name: 'New Hampshire', baseRateBasisPoints: 0 },
  { code: 'NJ', name: 'New Jersey', baseRateBasisPoints: 662.5 },
  { code: 'NM', name: 'New Mexico', baseRateBasisPoints: 487.5 },
  { code: 'NY', name: 'New York', baseRateBasisPoints: 400 },
  { code: 'NC', name: 'North Carolina', baseRateBasisPoints: 475 },
  { code: 'ND', name: 'North Dakota', baseRateBasisPoints: 500 },
  { code: 'OH', name: 'Ohio', baseRateBasisPoints: 575 },
  { code: 'OK', name: 'Oklahoma', baseRateBasisPoints: 450 },
  { code: 'OR', name: 'Oregon', baseRateBasisPoints: 0 },
  { code: 'PA', name: 'Pennsylvania', baseRateBasisPoints: 600 },
  { code: 'RI', name: 'Rhode Island', baseRateBasisPoints: 700 },
  { code: 'SC', name: 'South Carolina', baseRateBasisPoints: 600 },
  { code: 'SD', name: 'South Dakota', baseRateBasisPoints: 420 },
  { code: 'TN', name: 'Tennessee', baseRateBasisPoints: 700 },
  { code: 'TX', name: 'Texas', baseRateBasisPoints: 625 },
  { code: 'UT', name: 'Utah', baseRateBasisPoints: 610 },
  { code: 'VT', name: 'Vermont', baseRateBasisPoints: 600 },
  { code: 'VA', name: 'Virginia', baseRateBasisPoints: 530 },
  { code: 'WA', name: 'Washington', baseRateBasisPoints: 650 },
  { code: 'WV', name: 'West Virginia', baseRateBasisPoints: 600 },
  { code: 'WI', name: 'Wisconsin', baseRateBasisPoints: 500 },
  { code: 'WY', name: 'Wyoming', baseRateBasisPoints: 400 },
]
